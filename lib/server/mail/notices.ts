import "server-only";
import { setImmediate as nextTurn } from "node:timers/promises";
import { and, asc, count, eq, isNull, lte, max, sql, TransactionRollbackError } from "drizzle-orm";
import type { Executor } from "@/db/client";
import { getDb } from "@/db/client";
import { preparedQuery } from "@/db/prepared";
import { mailPreferences, notices, users } from "@/db/schema";
import { env } from "@/lib/env";
import { newId } from "../crypto";
import { enqueueMail } from "./enqueue";
import type { NoticeKind } from "./notice-kinds";
import { noticesMail } from "./templates";

interface Notice {
  kind: NoticeKind;
  /** Everyone the event concerns; the actor and anyone who turned this off are dropped here. */
  to: string[];
  actorId: string;
  manuscriptId: string;
  /** The figure it is about, so that people who unfollowed that figure are left out. */
  figureId?: string;
  manuscriptTitle: string;
  /** What it is about without the manuscript, e.g. "Figure 2b needs revision". */
  headline: string;
  lines: string[];
  href: string;
}

/** A manuscript title short enough for a subject line: cut at a word, with an ellipsis. */
export function shortTitle(title: string, max = 48): string {
  if (title.length <= max) return title;
  const cut = title.slice(0, max - 1);
  const space = cut.lastIndexOf(" ");
  return `${(space > max / 2 ? cut.slice(0, space) : cut).replace(/[\s,;:.–—-]+$/, "")}…`;
}

/** The recipients' mail choices: one statement for any number of them (ids as a JSON array). */
const preferencesOf = preparedQuery((db) =>
  db
    .select()
    .from(mailPreferences)
    .where(sql`${mailPreferences.userId} in (select value from json_each(${sql.placeholder("ids")}))`)
    .prepare(),
);

const insertNotice = preparedQuery((db) =>
  db
    .insert(notices)
    .values({
      id: sql.placeholder("id"),
      userId: sql.placeholder("userId"),
      kind: sql.placeholder("kind"),
      manuscriptId: sql.placeholder("manuscriptId"),
      figureId: sql.placeholder("figureId"),
      subject: sql.placeholder("subject"),
      headline: sql.placeholder("headline"),
      body: sql.placeholder("body"),
      href: sql.placeholder("href"),
    })
    .prepare(),
);

/**
 * Writes one pending notice per recipient in the caller's transaction (so a notice exists exactly
 * when its event does). Never to the actor; not to whoever turned the kind off or unfollowed the
 * manuscript or the figure.
 */
export async function notify(tx: Executor, n: Notice): Promise<number> {
  const to = [...new Set(n.to)].filter((id) => id !== n.actorId);
  if (!to.length) return 0;
  const prefs = await preferencesOf(tx).all({ ids: JSON.stringify(to) });
  const wanted = to.filter((id) => {
    const p = prefs.find((x) => x.userId === id);
    if (!p) return true;
    const figureUnfollowed = n.figureId !== undefined && p.unfollowedFigures.includes(n.figureId);
    return !p.mutedKinds.includes(n.kind) && !p.unfollowed.includes(n.manuscriptId) && !figureUnfollowed;
  });
  const subject = `${n.headline} — ${shortTitle(n.manuscriptTitle)}`;
  const body = n.lines.join("\n");
  for (const userId of wanted) {
    await insertNotice(tx).run({
      id: newId(),
      userId,
      kind: n.kind,
      manuscriptId: n.manuscriptId,
      figureId: n.figureId ?? null,
      subject,
      headline: n.headline,
      body,
      href: n.href,
    });
  }
  return wanted.length;
}

/**
 * Turns each person's pending notices into one mail once the first of them is older than the
 * coalescing window (MAIL_COALESCE_SECONDS). Each person's notices are stamped with the mail's id
 * in the transaction that enqueues it, so a crash leaves either both or neither, and a second
 * worker finds nothing left to take: no notice is lost and none is mailed twice.
 */
/** A busy thread can leave hundreds of notices for one person in a window: a mail lists this many, then counts the rest. */
const MAX_LISTED = 50;

export async function flushNotices(now = Date.now()): Promise<number> {
  const db = getDb();
  const cutoff = now - env().mailCoalesceMs;
  const due = await db
    .select({ userId: notices.userId })
    .from(notices)
    .where(isNull(notices.mailId))
    .groupBy(notices.userId)
    .having(sql`min(${notices.createdAt}) <= ${cutoff}`);
  let mails = 0;
  for (const [i, { userId }] of due.entries()) {
    // Each person's mail is its own transaction; between them the server answers the requests waiting.
    if (i > 0) await nextTurn();
    const sent = await db
      .transaction(async (tx) => {
        const mine = and(eq(notices.userId, userId), isNull(notices.mailId));
        const [all] = await tx
          .select({ n: count(), last: max(notices.createdAt), kinds: sql<string>`json_group_array(distinct ${notices.kind})` })
          .from(notices)
          .where(mine);
        const [u] = await tx.select({ email: users.email }).from(users).where(eq(users.id, userId));
        if (!all?.n || !all.last || !u) return false;
        const listed = await tx.select().from(notices).where(mine).orderBy(asc(notices.createdAt)).limit(MAX_LISTED);
        const unlistedKinds = all.n > listed.length ? (JSON.parse(all.kinds) as string[]) : [];
        const mailId = await enqueueMail(tx, noticesMail(u.email, userId, listed, { count: all.n - listed.length, kinds: unlistedKinds }));
        const taken = await tx
          .update(notices)
          .set({ mailId })
          .where(and(mine, lte(notices.createdAt, all.last)));
        if (taken.rowsAffected !== all.n) tx.rollback(); // another worker took some of them: leave it to that one
        return true;
      })
      .catch((err: unknown) => {
        if (err instanceof TransactionRollbackError) return false;
        throw err;
      });
    if (sent) mails++;
  }
  return mails;
}
