import "server-only";
import { and, eq, inArray, isNull, sql } from "drizzle-orm";
import { getDb } from "@/db/client";
import { preparedQuery } from "@/db/prepared";
import { comments, figures, manuscripts, panels, threads } from "@/db/schema";
import type { SessionUser } from "@/lib/authz";
import { manuscriptMembers } from "@/db/schema";
import { overviewSnapshot } from "./overview-snapshot";

export interface QueueItem {
  kind: "review" | "mention" | "signoff" | "revise";
  manuscriptId: string;
  manuscriptTitle: string;
  figureId: string;
  figureNumber: number;
  figureTitle: string;
  panelId?: string;
  letter?: string;
  state: string;
  since: string;
  what: string;
}

const membershipsWithStamps = preparedQuery((db) =>
  db
    .select({ manuscriptId: manuscriptMembers.manuscriptId, role: manuscriptMembers.role, title: manuscripts.title, reviewStamp: manuscripts.reviewStamp })
    .from(manuscriptMembers)
    .innerJoin(manuscripts, eq(manuscripts.id, manuscriptMembers.manuscriptId))
    .where(eq(manuscriptMembers.userId, sql.placeholder("userId")))
    .prepare(),
);

/** "Waiting on me" across every manuscript the caller belongs to. */
export async function waitingOnMe(user: SessionUser): Promise<QueueItem[]> {
  const memberships = await membershipsWithStamps().all({ userId: user.id });
  const reviews = await Promise.all(memberships.map(async (m) => (await overviewSnapshot(m.manuscriptId, m.reviewStamp)).reviews));
  const items: QueueItem[] = [];
  for (const [i, m] of memberships.entries()) {
    for (const f of reviews[i]) {
      const base = {
        manuscriptId: m.manuscriptId,
        manuscriptTitle: m.title,
        figureId: f.figure.id,
        figureNumber: f.figure.number,
        figureTitle: f.figure.title,
      };
      const required = f.figure.requiredReviewers;
      for (const p of f.panels) {
        // A draft asks nobody until its author sends it to review.
        if (!p.revision || f.state === "signed_off" || p.state === "draft") continue;
        const at = { ...base, panelId: p.panel.id, letter: p.letter, state: p.state, since: p.revision.createdAt.toISOString() };
        const mine = p.revision.createdBy === user.id;
        const expected = required.length ? required.includes(user.id) : m.role === "reviewer";
        const decided = p.approvedBy.includes(user.id) || p.needsRevisionBy.includes(user.id);
        if (!mine && expected && !decided && m.role !== "viewer")
          items.push({ kind: "review", ...at, what: `review panel ${p.letter} (revision ${p.revision.number})` });
        if (mine && p.state === "needs_revision") items.push({ kind: "revise", ...at, what: `panel ${p.letter} needs revision` });
      }
      if (m.role === "pi" && f.state === "approved")
        items.push({ kind: "signoff", ...base, state: f.state, since: new Date().toISOString(), what: `sign off figure ${f.figure.number}` });
    }
  }
  const waiting = await mentionsAwaitingReply(
    user.id,
    memberships.map((m) => m.manuscriptId),
  );
  for (const [i, m] of memberships.entries())
    for (const f of reviews[i])
      for (const p of f.panels)
        for (const [, e] of waiting.filter(([, e]) => e.panelId === p.panel.id))
          items.push({
            kind: "mention",
            manuscriptId: m.manuscriptId,
            manuscriptTitle: m.title,
            figureId: f.figure.id,
            figureNumber: f.figure.number,
            figureTitle: f.figure.title,
            panelId: p.panel.id,
            letter: p.letter,
            state: p.state,
            since: e.mentionAt.toISOString(),
            what: `you were mentioned on panel ${p.letter}`,
          });
  return items.sort((a, b) => a.since.localeCompare(b.since));
}

/**
 * Open threads of these manuscripts where the user was mentioned and has not written since, with
 * the last mention. Read from the comments that mention anyone (a partial index), then the user's
 * own last comment in just those threads, so the cost follows mentions, not the whole discussion.
 */
async function mentionsAwaitingReply(userId: string, manuscriptIds: string[]): Promise<Array<[string, { mentionAt: Date; panelId: string }]>> {
  if (!manuscriptIds.length) return [];
  const db = getDb();
  const mentioned = await db
    .select({ threadId: comments.threadId, panelId: threads.panelId, at: sql<number>`max(${comments.createdAt})` })
    .from(comments)
    .innerJoin(threads, eq(threads.id, comments.threadId))
    .innerJoin(panels, eq(panels.id, threads.panelId))
    .innerJoin(figures, eq(figures.id, panels.figureId))
    .where(
      and(
        sql`${comments.mentions} <> '[]'`,
        isNull(comments.deletedAt),
        sql`exists (select 1 from json_each(${comments.mentions}) where value = ${userId})`,
        isNull(threads.resolvedAt),
        inArray(figures.manuscriptId, manuscriptIds),
      ),
    )
    .groupBy(comments.threadId);
  if (!mentioned.length) return [];
  const replies = await db
    .select({ threadId: comments.threadId, at: sql<number>`max(${comments.createdAt})` })
    .from(comments)
    .where(
      and(
        inArray(
          comments.threadId,
          mentioned.map((m) => m.threadId),
        ),
        eq(comments.createdBy, userId),
        isNull(comments.deletedAt),
      ),
    )
    .groupBy(comments.threadId);
  const repliedAt = new Map(replies.map((r) => [r.threadId, r.at]));
  return mentioned
    .filter((m) => {
      const replied = repliedAt.get(m.threadId);
      return replied === undefined || replied < m.at;
    })
    .map((m) => [m.threadId, { mentionAt: new Date(m.at), panelId: m.panelId }]);
}
