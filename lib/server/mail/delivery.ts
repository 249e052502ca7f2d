import "server-only";
import { and, desc, eq, inArray } from "drizzle-orm";
import { getDb } from "@/db/client";
import { invitations, mailBounces, mailOutbox, manuscriptMembers, users } from "@/db/schema";
import { authorize, type SessionUser } from "@/lib/authz";
import { notFound } from "@/lib/errors";
import { appendAudit } from "../audit";

/** Mail kinds as the PI reads them (subjects are not shown: a mail may be about another manuscript). */
const KIND_LABELS: Record<string, string> = {
  sign_in_link: "sign-in link",
  invitation: "invitation",
  digest: "digest",
  notices: "review notices",
};
const kindLabel = (kind: string) => KIND_LABELS[kind] ?? `review notice (${kind.replace(/_/g, " ")})`;

/** The addresses of this manuscript's members and of its open or past invitations, lower-cased. */
async function addressesOf(manuscriptId: string): Promise<string[]> {
  const db = getDb();
  const members = await db
    .select({ email: users.email })
    .from(manuscriptMembers)
    .innerJoin(users, eq(users.id, manuscriptMembers.userId))
    .where(eq(manuscriptMembers.manuscriptId, manuscriptId));
  const invited = await db.select({ email: invitations.email }).from(invitations).where(eq(invitations.manuscriptId, manuscriptId));
  return [...new Set([...members, ...invited].map((r) => r.email.toLowerCase()))];
}

/**
 * For the PI on the members page: mail to this manuscript's people that failed for good (retries
 * used up, or refused by the receiving server) with the SMTP answer, and the addresses that bounce.
 */
export async function mailDeliveryFor(user: SessionUser, manuscriptId: string) {
  await authorize(user, "member.manage", manuscriptId);
  const addresses = await addressesOf(manuscriptId);
  if (!addresses.length) return { failed: [], bounced: [] };
  const db = getDb();
  const failed = await db
    .select({
      id: mailOutbox.id,
      to: mailOutbox.to,
      kind: mailOutbox.kind,
      createdAt: mailOutbox.createdAt,
      attempts: mailOutbox.attempts,
      answer: mailOutbox.lastError,
    })
    .from(mailOutbox)
    .where(and(eq(mailOutbox.status, "failed"), inArray(mailOutbox.to, addresses)))
    .orderBy(desc(mailOutbox.createdAt))
    .limit(50);
  const bounced = await db.select().from(mailBounces).where(inArray(mailBounces.email, addresses));
  return {
    failed: failed.map((f) => ({ ...f, what: kindLabel(f.kind), answer: f.answer ?? "" })),
    bounced: bounced.map((b) => ({ email: b.email, answer: b.answer, at: b.at })),
  };
}

/** Sends a failed mail again from the start (its own retries and back-off); the PI of a manuscript its address belongs to. */
export async function resendMail(user: SessionUser, manuscriptId: string, mailId: string): Promise<{ to: string }> {
  await authorize(user, "member.manage", manuscriptId);
  const addresses = await addressesOf(manuscriptId);
  return getDb().transaction(async (tx) => {
    const [m] = await tx.select({ to: mailOutbox.to, status: mailOutbox.status }).from(mailOutbox).where(eq(mailOutbox.id, mailId));
    if (!m || m.status !== "failed" || !addresses.includes(m.to.toLowerCase())) throw notFound("No failed mail with this id to this manuscript's people.");
    await tx.update(mailOutbox).set({ status: "pending", attempts: 0, nextAttemptAt: new Date(), leaseUntil: null }).where(eq(mailOutbox.id, mailId));
    await appendAudit(tx, { actorId: user.id, manuscriptId, action: "mail.resend", target: `mail:${mailId}`, data: { to: m.to } });
    return { to: m.to };
  });
}
