import "server-only";
import { and, eq, inArray } from "drizzle-orm";
import { z } from "zod";
import { getDb } from "@/db/client";
import { mailPreferences, manuscriptMembers, manuscripts } from "@/db/schema";
import { authorize, type SessionUser } from "@/lib/authz";
import { appendAudit } from "../audit";
import { NOTICE_KINDS, NOTICE_LABELS } from "./notice-kinds";

/**
 * The preferences form: a checkbox `kind.<kind>` per notice kind, and per manuscript shown a hidden
 * `follow-shown.<id>` plus a checkbox `follow.<id>`; a ticked box sends "on".
 */
export const mailPreferencesInput = z.record(z.string().max(200), z.string().max(10)).refine((r) => Object.keys(r).length <= 500, "too many fields");

/** Which notices the caller gets, and which of their manuscripts they follow. */
export async function getMailPreferences(user: SessionUser) {
  await authorize(user, "self.mail");
  const [p] = await getDb().select().from(mailPreferences).where(eq(mailPreferences.userId, user.id));
  const mine = await getDb()
    .select({ id: manuscripts.id, title: manuscripts.title })
    .from(manuscriptMembers)
    .innerJoin(manuscripts, eq(manuscripts.id, manuscriptMembers.manuscriptId))
    .where(eq(manuscriptMembers.userId, user.id));
  return {
    kinds: NOTICE_KINDS.map((kind) => ({ kind, label: NOTICE_LABELS[kind], on: !p?.mutedKinds.includes(kind) })),
    manuscripts: mine.sort((a, b) => a.title.localeCompare(b.title)).map((m) => ({ ...m, following: !p?.unfollowed.includes(m.id) })),
  };
}

/** Stores the whole form: an unticked kind is turned off, an unticked manuscript unfollowed. */
export async function saveMailPreferences(user: SessionUser, raw: z.infer<typeof mailPreferencesInput>) {
  await authorize(user, "self.mail");
  const input = mailPreferencesInput.parse(raw);
  const mutedKinds = NOTICE_KINDS.filter((k) => input[`kind.${k}`] !== "on");
  await getDb().transaction(async (tx) => {
    const ids = Object.keys(input)
      .filter((k) => k.startsWith("follow-shown."))
      .map((k) => k.slice("follow-shown.".length));
    const member = ids.length
      ? await tx
          .select({ id: manuscriptMembers.manuscriptId })
          .from(manuscriptMembers)
          .where(and(eq(manuscriptMembers.userId, user.id), inArray(manuscriptMembers.manuscriptId, ids)))
      : [];
    const [p] = await tx.select().from(mailPreferences).where(eq(mailPreferences.userId, user.id));
    const shown = new Set(member.map((m) => m.id));
    // Manuscripts not on the form (joined since it was drawn) keep their setting.
    const unfollowed = [
      ...new Set([...(p?.unfollowed ?? []).filter((id) => !shown.has(id)), ...[...shown].filter((id) => input[`follow.${id}`] !== "on")]),
    ].sort();
    const now = new Date();
    await tx
      .insert(mailPreferences)
      .values({ userId: user.id, mutedKinds, unfollowed, updatedAt: now })
      .onConflictDoUpdate({ target: mailPreferences.userId, set: { mutedKinds, unfollowed, updatedAt: now } });
    await appendAudit(tx, { actorId: user.id, action: "mail.preferences", target: `user:${user.id}`, data: { mutedKinds, unfollowed } });
  });
  return getMailPreferences(user);
}
