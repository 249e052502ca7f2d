import "server-only";
import { and, asc, eq, inArray, isNull } from "drizzle-orm";
import { z } from "zod";
import { getDb, type Executor } from "@/db/client";
import { DIGEST_FREQUENCIES, figures, mailPreferences, manuscriptMembers, manuscripts } from "@/db/schema";
import { authorize, type SessionUser } from "@/lib/authz";
import { badRequest } from "@/lib/errors";
import { appendAudit } from "../audit";
import { DEFAULT_DIGEST_SCHEDULE, isTimeZone } from "./digest-schedule";
import { NOTICE_KINDS, NOTICE_LABELS } from "./notice-kinds";

/**
 * The preferences form: a checkbox `kind.<kind>` per notice kind, per manuscript shown a hidden
 * `follow-shown.<id>` plus a checkbox `follow.<id>`, and the same per figure (`figure-shown.<id>`,
 * `figure.<id>`); a ticked box sends "on". `digest` (off, daily,
 * weekly), `digestHour` (0–23) and `timeZone` (IANA) choose the digest; absent, they keep their value.
 */
export const mailPreferencesInput = z.record(z.string().max(200), z.string().max(64)).refine((r) => Object.keys(r).length <= 500, "too many fields");

/** Which notices the caller gets, and which of their manuscripts and figures they follow. */
export async function getMailPreferences(user: SessionUser) {
  await authorize(user, "self.mail");
  const [p] = await getDb().select().from(mailPreferences).where(eq(mailPreferences.userId, user.id));
  const mine = await getDb()
    .select({ id: manuscripts.id, title: manuscripts.title })
    .from(manuscriptMembers)
    .innerJoin(manuscripts, eq(manuscripts.id, manuscriptMembers.manuscriptId))
    .where(eq(manuscriptMembers.userId, user.id));
  const figs = await figuresOf(mine.map((m) => m.id));
  return {
    kinds: NOTICE_KINDS.map((kind) => ({ kind, label: NOTICE_LABELS[kind], on: !p?.mutedKinds.includes(kind) })),
    manuscripts: mine
      .sort((a, b) => a.title.localeCompare(b.title))
      .map((m) => ({
        ...m,
        following: !p?.unfollowed.includes(m.id),
        figures: figs
          .filter((f) => f.manuscriptId === m.id)
          .map((f) => ({ id: f.id, label: `Figure ${f.number}${f.title ? ` — ${f.title}` : ""}`, following: !p?.unfollowedFigures.includes(f.id) })),
      })),
    digest: {
      frequency: p?.digest ?? DEFAULT_DIGEST_SCHEDULE.frequency,
      hour: p?.digestHour ?? DEFAULT_DIGEST_SCHEDULE.hour,
      /** Null until chosen: the page proposes the browser's zone. */
      timeZone: p?.timeZone ?? null,
    },
  };
}

/** The figures in use (not archived) of the given manuscripts, by number. */
async function figuresOf(manuscriptIds: string[], db: Executor = getDb()) {
  if (!manuscriptIds.length) return [];
  return db
    .select({ id: figures.id, manuscriptId: figures.manuscriptId, number: figures.number, title: figures.title })
    .from(figures)
    .where(and(inArray(figures.manuscriptId, manuscriptIds), isNull(figures.archivedAt)))
    .orderBy(asc(figures.number));
}

/** The ids behind `<prefix>.<id>` checkboxes shown on the form, and which of them were left unticked. */
function choices(input: Record<string, string>, shownPrefix: string, boxPrefix: string, allowed: Set<string>) {
  const shown = Object.keys(input)
    .filter((k) => k.startsWith(`${shownPrefix}.`))
    .map((k) => k.slice(shownPrefix.length + 1))
    .filter((id) => allowed.has(id));
  return { shown: new Set(shown), unticked: shown.filter((id) => input[`${boxPrefix}.${id}`] !== "on") };
}

/** Items not on the form (added since it was drawn) keep their setting. */
const merge = (before: string[], c: { shown: Set<string>; unticked: string[] }) =>
  [...new Set([...before.filter((id) => !c.shown.has(id)), ...c.unticked])].sort();

/** Stores the whole form: an unticked kind is turned off, an unticked manuscript or figure unfollowed. */
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
    const member = await tx.select({ id: manuscriptMembers.manuscriptId }).from(manuscriptMembers).where(eq(manuscriptMembers.userId, user.id));
    const mine = member.map((m) => m.id);
    const figs = await figuresOf(mine, tx);
    const [p] = await tx.select().from(mailPreferences).where(eq(mailPreferences.userId, user.id));
    const unfollowed = merge(p?.unfollowed ?? [], choices(input, "follow-shown", "follow", new Set(mine)));
    const unfollowedFigures = merge(p?.unfollowedFigures ?? [], choices(input, "figure-shown", "figure", new Set(figs.map((f) => f.id))));
    const now = new Date();
    const schedule = {
      digest: digest ?? p?.digest ?? DEFAULT_DIGEST_SCHEDULE.frequency,
      digestHour: digestHour ?? p?.digestHour ?? DEFAULT_DIGEST_SCHEDULE.hour,
      timeZone: timeZone ?? p?.timeZone ?? null,
    };
    await tx
      .insert(mailPreferences)
      .values({ userId: user.id, mutedKinds, unfollowed, unfollowedFigures, ...schedule, updatedAt: now })
      .onConflictDoUpdate({ target: mailPreferences.userId, set: { mutedKinds, unfollowed, unfollowedFigures, ...schedule, updatedAt: now } });
    await appendAudit(tx, {
      actorId: user.id,
      action: "mail.preferences",
      target: `user:${user.id}`,
      data: { mutedKinds, unfollowed, unfollowedFigures, ...schedule },
    });
  });
  return getMailPreferences(user);
}
