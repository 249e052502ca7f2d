import "server-only";
import { and, count, eq, gt, lt, min, sql } from "drizzle-orm";
import { getDb, type Executor } from "@/db/client";
import { preparedQuery } from "@/db/prepared";
import { rateEvents } from "@/db/schema";
import { tooManyRequests } from "@/lib/errors";

export interface RateRule {
  /** Bucket key, e.g. `sign-in-link:addr:pi@lab.example.org`. */
  bucket: string;
  /** At most this many events per window. */
  max: number;
  windowMs: number;
  /** Sentence shown when the limit is reached; the wait is appended. */
  message: string;
}

interface RateCheck {
  allowed: boolean;
  retryAfterSeconds: number;
}

const bucketSince = preparedQuery((db) =>
  db
    .select({ n: count(), oldest: min(rateEvents.at) })
    .from(rateEvents)
    .where(and(eq(rateEvents.bucket, sql.placeholder("bucket")), gt(rateEvents.at, sql.placeholder("since"))))
    .prepare(),
);
const insertEvent = preparedQuery((db) =>
  db
    .insert(rateEvents)
    .values({ bucket: sql.placeholder("bucket"), at: sql.placeholder("at") })
    .prepare(),
);

/** How the bucket stands now, without recording anything. Shared through the database, so every instance counts. */
async function peekRate(rule: RateRule, now: number, db: Executor): Promise<RateCheck> {
  const row = await bucketSince(db).get({ bucket: rule.bucket, since: now - rule.windowMs }); // milliseconds, as the column stores them
  const n = row?.n ?? 0;
  if (n < rule.max) return { allowed: true, retryAfterSeconds: 0 };
  const oldest = row?.oldest instanceof Date ? row.oldest.getTime() : now;
  return { allowed: false, retryAfterSeconds: Math.max(1, Math.ceil((oldest + rule.windowMs - now) / 1000)) };
}

/**
 * Records one event under every rule, or throws 429 (with Retry-After) naming the first rule that is
 * full. Inside a write's transaction (`db`), the event is kept only if the write is, and both cost one commit.
 */
export async function consumeRate(rules: RateRule[], now = Date.now(), db: Executor = getDb()): Promise<void> {
  for (const rule of rules) {
    const check = await peekRate(rule, now, db);
    if (!check.allowed) throw tooManyRequests(`${rule.message} Try again in ${describeWait(check.retryAfterSeconds)}.`, check.retryAfterSeconds);
  }
  for (const r of rules) await insertEvent(db).run({ bucket: r.bucket, at: new Date(now) });
  // Old events are pruned now and then, not on every write.
  if (Math.random() > 0.02) return;
  const longest = Math.max(...rules.map((r) => r.windowMs));
  await db.delete(rateEvents).where(lt(rateEvents.at, new Date(now - 2 * Math.max(longest, 24 * 3600_000))));
}

export function describeWait(seconds: number): string {
  if (seconds < 90) return `${seconds} s`;
  if (seconds < 5400) return `${Math.ceil(seconds / 60)} min`;
  return `${Math.ceil(seconds / 3600)} h`;
}
