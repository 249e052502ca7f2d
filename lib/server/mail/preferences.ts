import "server-only";
import { and, eq, inArray } from "drizzle-orm";
import { z } from "zod";
import { getDb } from "@/db/client";
import { DIGEST_FREQUENCIES, mailPreferences, manuscriptMembers, manuscripts } from "@/db/schema";
import { authorize, type SessionUser } from "@/lib/authz";
import { badRequest } from "@/lib/errors";
import { appendAudit } from "../audit";
import { DEFAULT_DIGEST_SCHEDULE, isTimeZone } from "./digest-schedule";
import { NOTICE_KINDS, NOTICE_LABELS } from "./notice-kinds";

/**
 * The preferences form: a checkbox `kind.<kind>` per notice kind, and per manuscript shown a hidden
 * `follow-shown.<id>` plus a checkbox `follow.<id>`; a ticked box sends "on". `digest` (off, daily,
 * weekly), `digestHour` (0–23) and `timeZone` (IANA) choose the digest; absent, they keep their value.
 */
export const mailPreferencesInput = z.record(z.string().max(200), z.string().max(64)).refine((r) => Object.keys(r).length <= 500, "too many fields");

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
    digest: {
      frequency: p?.digest ?? DEFAULT_DIGEST_SCHEDULE.frequency,
      hour: p?.digestHour ?? DEFAULT_DIGEST_SCHEDULE.hour,
      /** Null until chosen: the page proposes the browser's zone. */
      timeZone: p?.timeZone ?? null,
    },
  };
}

/** Stores the whole form: an unticked kind is turned off, an unticked manuscript unfollowed. */
export async function saveMailPreferences(user: SessionUser, raw: z.infer<typeof mailPreferencesInput>) {
  await authorize(user, "self.mail");
  const input = mailPreferencesInput.parse(raw);
  const mutedKinds = NOTICE_KINDS.filter((k) => input[`kind.${k}`] !== "on");
  const digest = input.digest === undefined ? undefined : z.enum(DIGEST_FREQUENCIES, { error: "digest: choose off, daily or weekly." }).parse(input.digest);
  const digestHour =
    input.digestHour === undefined ? undefined : z.coerce.number({ error: "digestHour: a whole hour, 0 to 23." }).int().min(0).max(23).parse(input.digestHour);
  const timeZone = input.timeZone === undefined || input.timeZone === "" ? undefined : input.timeZone;
  if (timeZone !== undefined && !isTimeZone(timeZone)) throw badRequest(`timeZone: "${timeZone}" is not a time zone name such as Europe/Berlin.`);
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
    const schedule = {
      digest: digest ?? p?.digest ?? DEFAULT_DIGEST_SCHEDULE.frequency,
      digestHour: digestHour ?? p?.digestHour ?? DEFAULT_DIGEST_SCHEDULE.hour,
      timeZone: timeZone ?? p?.timeZone ?? null,
    };
    await tx
      .insert(mailPreferences)
      .values({ userId: user.id, mutedKinds, unfollowed, ...schedule, updatedAt: now })
      .onConflictDoUpdate({ target: mailPreferences.userId, set: { mutedKinds, unfollowed, ...schedule, updatedAt: now } });
    await appendAudit(tx, { actorId: user.id, action: "mail.preferences", target: `user:${user.id}`, data: { mutedKinds, unfollowed, ...schedule } });
  });
  return getMailPreferences(user);
}
