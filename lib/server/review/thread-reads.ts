import "server-only";
import { and, asc, eq, inArray, sql } from "drizzle-orm";
import { getDb } from "@/db/client";
import { preparedQuery } from "@/db/prepared";
import { comments, figures, panels, revisions, threadFollows, threads, users } from "@/db/schema";
import { authorize, type SessionUser } from "@/lib/authz";
import { notFound } from "@/lib/errors";
import { onceInRequest } from "@/lib/request-memo";
import { manuscriptOfPanel } from "../figures/scope";

/** Reading threads: where one belongs, and threads with their comments as a member sees them. */
const threadRow = preparedQuery((db) =>
  db
    .select({ panelId: threads.panelId, manuscriptId: figures.manuscriptId })
    .from(threads)
    .innerJoin(panels, eq(panels.id, threads.panelId))
    .innerJoin(figures, eq(figures.id, panels.figureId))
    .where(eq(threads.id, sql.placeholder("threadId")))
    .prepare(),
);

/** The panel and manuscript a thread belongs to (fixed once it is written, so asked once per request). */
export function threadContext(threadId: string): Promise<{ thread: { panelId: string }; manuscriptId: string }> {
  return onceInRequest(`threadContext:${threadId}`, async () => {
    const t = await threadRow().get({ threadId });
    if (!t) throw notFound();
    return { thread: { panelId: t.panelId }, manuscriptId: t.manuscriptId };
  });
}
export const manuscriptOfThread = async (threadId: string) => (await threadContext(threadId)).manuscriptId;

export async function getThread(user: SessionUser, threadId: string) {
  const { thread } = await threadContext(threadId);
  return (await listThreadsWhere(user, thread.panelId, [threadId]))[0];
}

export async function listThreads(user: SessionUser, panelId: string) {
  return listThreadsWhere(user, panelId);
}

async function listThreadsWhere(user: SessionUser, panelId: string, only?: string[]) {
  await authorize(user, "manuscript.read", await manuscriptOfPanel(panelId));
  const ts = await getDb()
    .select({ t: threads, rev: revisions.number })
    .from(threads)
    .innerJoin(revisions, eq(revisions.id, threads.revisionId))
    .where(only ? inArray(threads.id, only) : eq(threads.panelId, panelId))
    .orderBy(asc(threads.createdAt));
  const cs = ts.length
    ? await getDb()
        .select({ c: comments, name: users.name })
        .from(comments)
        .innerJoin(users, eq(users.id, comments.createdBy))
        .where(
          inArray(
            comments.threadId,
            ts.map((t) => t.t.id),
          ),
        )
        .orderBy(asc(comments.createdAt))
    : [];
  const mine = ts.length
    ? await getDb()
        .select()
        .from(threadFollows)
        .where(
          and(
            eq(threadFollows.userId, user.id),
            inArray(
              threadFollows.threadId,
              ts.map((t) => t.t.id),
            ),
          ),
        )
    : [];
  // Whether a reply reaches the caller by mail: their own choice, else whether they wrote in it.
  const following = (threadId: string) =>
    mine.find((f) => f.threadId === threadId)?.following ?? cs.some(({ c }) => c.threadId === threadId && c.createdBy === user.id && !c.deletedAt);
  return ts.map(({ t, rev }) => ({
    ...t,
    revisionNumber: rev,
    status: t.resolvedAt ? "resolved" : "open",
    followingReplies: following(t.id),
    comments: cs
      .filter(({ c }) => c.threadId === t.id && !c.deletedAt)
      .map(({ c, name }) => ({
        id: c.id,
        body: c.body,
        html: c.html,
        mentions: c.mentions,
        createdBy: c.createdBy,
        authorName: name,
        createdAt: c.createdAt,
        editedAt: c.editedAt,
      })),
  }));
}

export async function manuscriptOfComment(commentId: string): Promise<string> {
  const [c] = await getDb().select({ threadId: comments.threadId }).from(comments).where(eq(comments.id, commentId));
  if (!c) throw notFound();
  return manuscriptOfThread(c.threadId);
}
