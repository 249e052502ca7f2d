import "server-only";
import { and, eq, gt, isNull } from "drizzle-orm";
import { z } from "zod";
import type { Transaction } from "@/db/client";
import { getDb } from "@/db/client";
import { invitations, manuscriptMembers, manuscripts, ROLES, users } from "@/db/schema";
import { authorize, ROLE_MEMO_PREFIX, type SessionUser } from "@/lib/authz";
import { forgetInRequest } from "@/lib/request-memo";
import { appendAudit } from "./audit";
import { newId, newSecret, sha256Hex } from "./crypto";
import { badRequest, conflict, notFound } from "@/lib/errors";
import { enqueueMail } from "./mail/enqueue";
import { deliverOutbox } from "./mail/outbox";
import { invitationMail } from "./mail/templates";
import { consumeRate, type RateRule } from "./limits/rate-limit";
import { getManuscriptTitle } from "./manuscripts";
import { emailInput, hashPassword, normaliseEmail } from "./users";

const INVITE_TTL_MS = 7 * 24 * 3600 * 1000;
const HOUR_MS = 3600 * 1000;

/** Invitations are mail to outsiders: a few per address a day, a few dozen per manuscript an hour. */
function invitationRateRules(manuscriptId: string, email: string): RateRule[] {
  return [
    { bucket: `invite:to:${email}`, max: 3, windowMs: 24 * HOUR_MS, message: `${email} has been invited 3 times today.` },
    { bucket: `invite:manuscript:${manuscriptId}`, max: 30, windowMs: HOUR_MS, message: "This manuscript has sent 30 invitations in the last hour." },
  ];
}

export const inviteInput = z.object({
  email: emailInput,
  role: z.enum(ROLES, { message: `role must be one of ${ROLES.join(", ")}.` }),
});
export const changeRoleInput = z.object({ role: z.enum(ROLES, { message: `role must be one of ${ROLES.join(", ")}.` }) });

export async function inviteMember(user: SessionUser, manuscriptId: string, input: z.infer<typeof inviteInput>) {
  await authorize(user, "member.manage", manuscriptId);
  const { email: rawEmail, role } = inviteInput.parse(input);
  const email = normaliseEmail(rawEmail);
  const title = await getManuscriptTitle(manuscriptId);
  const [existing] = await getDb()
    .select({ role: manuscriptMembers.role })
    .from(manuscriptMembers)
    .innerJoin(users, eq(users.id, manuscriptMembers.userId))
    .where(and(eq(manuscriptMembers.manuscriptId, manuscriptId), eq(users.email, email)));
  if (existing) throw conflict(`${email} is already a member (${existing.role}). Change the role instead.`);
  await consumeRate(invitationRateRules(manuscriptId, email));
  const { secret, hash } = newSecret("pli");
  const id = newId();
  const expiresAt = new Date(Date.now() + INVITE_TTL_MS);
  await getDb().transaction(async (tx) => {
    await tx.insert(invitations).values({ id, manuscriptId, email, role, tokenHash: hash, invitedBy: user.id, expiresAt });
    await enqueueMail(tx, invitationMail(email, secret, user.name, title, role));
    await appendAudit(tx, { actorId: user.id, manuscriptId, action: "member.invite", target: `invitation:${id}`, data: { email, role } });
  });
  void deliverOutbox().catch(() => undefined);
  return { id, email, role, expiresAt: expiresAt.toISOString(), status: "invited" as const };
}

async function pisLeft(tx: Transaction, manuscriptId: string, exceptUserId: string) {
  const pis = await tx
    .select({ userId: manuscriptMembers.userId })
    .from(manuscriptMembers)
    .where(and(eq(manuscriptMembers.manuscriptId, manuscriptId), eq(manuscriptMembers.role, "pi")));
  return pis.filter((p) => p.userId !== exceptUserId).length;
}

/** The member row; refuses when `losesPi` would take away the manuscript's last PI. */
async function memberKeepingAPi(tx: Transaction, manuscriptId: string, memberId: string, losesPi: boolean) {
  const [m] = await tx
    .select()
    .from(manuscriptMembers)
    .where(and(eq(manuscriptMembers.manuscriptId, manuscriptId), eq(manuscriptMembers.userId, memberId)));
  if (!m) throw notFound("No such member.");
  if (m.role === "pi" && losesPi && (await pisLeft(tx, manuscriptId, memberId)) === 0)
    throw conflict("A manuscript always keeps at least one PI. Make someone else PI first.");
  return m;
}

export async function changeMemberRole(user: SessionUser, manuscriptId: string, memberId: string, input: z.infer<typeof changeRoleInput>) {
  await authorize(user, "member.manage", manuscriptId);
  const { role } = changeRoleInput.parse(input);
  await getDb().transaction(async (tx) => {
    const m = await memberKeepingAPi(tx, manuscriptId, memberId, role !== "pi");
    await tx
      .update(manuscriptMembers)
      .set({ role })
      .where(and(eq(manuscriptMembers.manuscriptId, manuscriptId), eq(manuscriptMembers.userId, memberId)));
    await appendAudit(tx, { actorId: user.id, manuscriptId, action: "member.role", target: `user:${memberId}`, data: { from: m.role, to: role } });
  });
  forgetInRequest(ROLE_MEMO_PREFIX);
}

export async function removeMember(user: SessionUser, manuscriptId: string, memberId: string) {
  await authorize(user, "member.manage", manuscriptId);
  await getDb().transaction(async (tx) => {
    const m = await memberKeepingAPi(tx, manuscriptId, memberId, true);
    await tx.delete(manuscriptMembers).where(and(eq(manuscriptMembers.manuscriptId, manuscriptId), eq(manuscriptMembers.userId, memberId)));
    await appendAudit(tx, { actorId: user.id, manuscriptId, action: "member.remove", target: `user:${memberId}`, data: { role: m.role } });
  });
  forgetInRequest(ROLE_MEMO_PREFIX);
}

export async function listPendingInvitations(user: SessionUser, manuscriptId: string) {
  await authorize(user, "manuscript.read", manuscriptId);
  return getDb()
    .select({ id: invitations.id, email: invitations.email, role: invitations.role, expiresAt: invitations.expiresAt })
    .from(invitations)
    .where(and(eq(invitations.manuscriptId, manuscriptId), isNull(invitations.acceptedAt), gt(invitations.expiresAt, new Date())));
}

/** What the invitation page shows before accepting; null when the link is unknown, used or expired. */
export async function describeInvitation(token: string) {
  const [inv] = await getDb()
    .select({
      id: invitations.id,
      email: invitations.email,
      role: invitations.role,
      manuscriptTitle: manuscripts.title,
      manuscriptId: invitations.manuscriptId,
    })
    .from(invitations)
    .innerJoin(manuscripts, eq(manuscripts.id, invitations.manuscriptId))
    .where(and(eq(invitations.tokenHash, sha256Hex(token)), isNull(invitations.acceptedAt), gt(invitations.expiresAt, new Date())));
  if (!inv) return null;
  const [account] = await getDb().select({ id: users.id }).from(users).where(eq(users.email, inv.email));
  return { ...inv, hasAccount: Boolean(account) };
}

export const acceptInput = z.object({
  token: z.string().min(10).max(200),
  name: z.string().trim().min(1, "Tell us your name.").max(120).optional(),
  password: z.string().min(10, "Choose a password of at least 10 characters.").max(200).optional(),
});

/**
 * Single use: the invitation is claimed by a conditional update inside the transaction. A new
 * address gets an account (name and password required); a known one gets the membership.
 */
export async function acceptInvitation(input: z.infer<typeof acceptInput>): Promise<{ userId: string; manuscriptId: string; email: string }> {
  const { token, name, password } = acceptInput.parse(input);
  const pwHash = password ? await hashPassword(password) : null;
  const joined = await getDb().transaction(async (tx) => {
    const [inv] = await tx
      .update(invitations)
      .set({ acceptedAt: new Date() })
      .where(and(eq(invitations.tokenHash, sha256Hex(token)), isNull(invitations.acceptedAt), gt(invitations.expiresAt, new Date())))
      .returning();
    if (!inv) throw notFound("This invitation is unknown, already used or expired. Ask the PI for a new one.");
    let [account] = await tx.select({ id: users.id }).from(users).where(eq(users.email, inv.email));
    if (!account) {
      if (!name || !pwHash) throw badRequest("name and password are needed to create your account.");
      account = { id: newId() };
      await tx.insert(users).values({ id: account.id, email: inv.email, name, passwordHash: pwHash });
    }
    await tx.update(invitations).set({ acceptedBy: account.id }).where(eq(invitations.id, inv.id));
    await tx
      .insert(manuscriptMembers)
      .values({ manuscriptId: inv.manuscriptId, userId: account.id, role: inv.role })
      .onConflictDoUpdate({ target: [manuscriptMembers.manuscriptId, manuscriptMembers.userId], set: { role: inv.role } });
    await appendAudit(tx, {
      actorId: account.id,
      manuscriptId: inv.manuscriptId,
      action: "member.join",
      target: `user:${account.id}`,
      data: { role: inv.role },
    });
    return { userId: account.id, manuscriptId: inv.manuscriptId, email: inv.email };
  });
  forgetInRequest(ROLE_MEMO_PREFIX);
  return joined;
}
