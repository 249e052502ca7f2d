import "server-only";
import { eq, max, TransactionRollbackError } from "drizzle-orm";
import { getDb } from "@/db/client";
import { env } from "@/lib/env";
import { digestRuns, mailPreferences, manuscriptMembers, users } from "@/db/schema";
import { newId } from "../crypto";
import { buildDigest } from "./digest-content";
import { Places } from "./digest-places";
import { DEFAULT_DIGEST_SCHEDULE, latestDigestSlot, previousDigestSlot, type DigestSchedule } from "./digest-schedule";
import { enqueueMail } from "./enqueue";
import { digestMail } from "./templates";

/** A digest never reaches further back than this, however long the person had it off. */
const LONGEST_WINDOW_MS = 35 * 24 * 60 * 60 * 1000;

interface DigestRunResult {
  /** Digests enqueued as mail. */
  sent: number;
  /** Periods recorded with nothing to say (no mail). */
  empty: number;
  /** Periods another run (a rerun, another instance) had already taken. */
  taken: number;
}

/** Points where a test stands in for a crash or for another instance finishing first. */
interface RunHooks {
  /** After the digest is built, before its transaction: another instance may take the period here. */
  afterBuild?: (userId: string) => Promise<void>;
  /** Inside the transaction, after the mail is enqueued and before the period is marked. */
  beforeMark?: (userId: string) => Promise<void>;
}

/**
 * Builds and enqueues every digest due at `now`: for each person with digests on, the latest
 * moment their schedule names (see latestDigestSlot) unless a digest for it exists. Its window
 * runs from their previous digest (or the slot before) to that moment. The mail and the unique
 * (person, period) row are written in one transaction, so a crash leaves both or neither and a
 * second run or instance that built the same digest stores nothing. Missed periods (the server was
 * down) fold into the next one: one digest, never a backlog.
 */
export async function runDigests(now = new Date(), hooks: RunHooks = {}): Promise<DigestRunResult> {
  const db = getDb();
  const result: DigestRunResult = { sent: 0, empty: 0, taken: 0 };
  const people = await db
    .select({ id: users.id, name: users.name, email: users.email, p: mailPreferences })
    .from(users)
    .leftJoin(mailPreferences, eq(mailPreferences.userId, users.id));
  const last = new Map(
    (
      await db
        .select({ userId: digestRuns.userId, at: max(digestRuns.periodStart) })
        .from(digestRuns)
        .groupBy(digestRuns.userId)
    ).map((r) => [r.userId, r.at]),
  );
  const places = new Places();
  for (const person of people) {
    const schedule: DigestSchedule = person.p
      ? { frequency: person.p.digest, hour: person.p.digestHour, timeZone: person.p.timeZone ?? DEFAULT_DIGEST_SCHEDULE.timeZone }
      : DEFAULT_DIGEST_SCHEDULE;
    if (schedule.frequency === "off") continue;
    const slot = latestDigestSlot(schedule, now);
    const previous = last.get(person.id);
    if (!slot || (previous && previous >= slot)) continue;
    const memberships = (
      await db
        .select({ manuscriptId: manuscriptMembers.manuscriptId, role: manuscriptMembers.role })
        .from(manuscriptMembers)
        .where(eq(manuscriptMembers.userId, person.id))
    ).filter((m) => !person.p?.unfollowed.includes(m.manuscriptId));
    if (!memberships.length) continue;
    const since = new Date(Math.max((previous ?? previousDigestSlot(schedule, slot) ?? slot).getTime(), slot.getTime() - LONGEST_WINDOW_MS));
    const reader = { id: person.id, name: person.name, unfollowedFigures: person.p?.unfollowedFigures };
    const digest = await buildDigest(reader, memberships, { frequency: schedule.frequency, timeZone: schedule.timeZone }, since, slot, places);
    await hooks.afterBuild?.(person.id);
    const outcome = await db
      .transaction(async (tx) => {
        const mailId = digest.count ? await enqueueMail(tx, digestMail(person.email, person.id, digest)) : null;
        await hooks.beforeMark?.(person.id);
        const marked = await tx
          .insert(digestRuns)
          .values({ id: newId(), userId: person.id, periodStart: slot, since, items: digest.count, mailId })
          .onConflictDoNothing()
          .returning({ id: digestRuns.id });
        if (!marked.length) tx.rollback(); // another run took this period: its mail is the one
        return mailId ? ("sent" as const) : ("empty" as const);
      })
      .catch((err: unknown) => {
        if (err instanceof TransactionRollbackError) return "taken" as const;
        throw err;
      });
    result[outcome]++;
  }
  return result;
}

let timer: NodeJS.Timeout | undefined;
/** Started once per server process beside the outbox worker; every instance may run it (the unique key decides). */
export function startDigestScheduler(intervalMs = env().digestIntervalMs): void {
  if (timer) return;
  timer = setInterval(() => {
    void runDigests().catch((err: unknown) => console.warn("[prooflight] digest run failed:", (err as Error).message));
  }, intervalMs);
  timer.unref();
}
