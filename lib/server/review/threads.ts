import "server-only";
import { and, eq, sql } from "drizzle-orm";
import { z } from "zod";
import type { Transaction } from "@/db/client";
import { getDb } from "@/db/client";
import { preparedQuery } from "@/db/prepared";
import { commentEdits, comments, manuscriptMembers, revisions, threads } from "@/db/schema";
import { authorize, type SessionUser } from "@/lib/authz";
import { appendAudit } from "../audit";
import { newId } from "../crypto";
import { badRequest, conflict, forbidden, notFound } from "@/lib/errors";
import { deliverOutboxSoon } from "../mail/outbox";
import { manuscriptOfPanel } from "../figures/scope";
import { getThread, threadContext } from "./thread-reads";
import { commentExcerpt, prepareCommentBody } from "./comment-body";
import { noticeComment } from "./review-notices";
import { editCommentInput, newThreadInput, replyInput } from "./schemas";
import { env } from "@/lib/env";
import { consumeRate, type RateRule } from "../limits/rate-limit";

const EDIT_WINDOW_MS = 15 * 60 * 1000;

const memberRows = preparedQuery((db) =>
  db
    .select({ id: manuscriptMembers.userId })
    .from(manuscriptMembers)
    .where(eq(manuscriptMembers.manuscriptId, sql.placeholder("manuscriptId")))
    .prepare(),
);
async function memberIds(manuscriptId: string) {
  return new Set((await memberRows().all({ manuscriptId })).map((r) => r.id));
}

const commentInsert = preparedQuery((db) =>
  db
    .insert(comments)
    .values({
      id: sql.placeholder("id"),
      threadId: sql.placeholder("threadId"),
      body: sql.placeholder("body"),
      html: sql.placeholder("html"),
      mentions: sql.placeholder("mentions"),
      clientKey: sql.placeholder("clientKey"),
      createdBy: sql.placeholder("createdBy"),
    })
    .onConflictDoNothing()
    .returning({ id: comments.id, createdAt: comments.createdAt })
    .prepare(),
);

async function insertComment(
  tx: Transaction,
  user: SessionUser,
  threadId: string,
  panelId: string,
  manuscriptId: string,
  prepared: { html: string; mentions: string[] },
  body: Record<string, unknown>,
  clientKey?: string,
) {
  const id = newId();
  // Two retries racing on a networked database meet at the unique (author, clientKey) index: the loser stores nothing.
  const inserted = await commentInsert(tx).get({
    id,
    threadId,
    body,
    html: prepared.html,
    mentions: prepared.mentions,
    clientKey: clientKey ?? null,
    createdBy: user.id,
  });
  if (!inserted) return null;
  await appendAudit(tx, { actorId: user.id, manuscriptId, action: "comment.create", target: `comment:${id}`, data: { threadId, mentions: prepared.mentions } });
  const excerpt = commentExcerpt(prepared.html, 300);
  await noticeComment(tx, user, { id, threadId, panelId, mentions: prepared.mentions, excerpt });
  return inserted;
}

/** A retried post with the same clientKey answers the comment already stored instead of a duplicate. */
const commentByClientKey = preparedQuery((db) =>
  db
    .select()
    .from(comments)
    .where(and(eq(comments.createdBy, sql.placeholder("userId")), eq(comments.clientKey, sql.placeholder("clientKey"))))
    .prepare(),
);
async function existingByClientKey(user: SessionUser, clientKey?: string) {
  if (!clientKey) return null;
  return (await commentByClientKey().get({ userId: user.id, clientKey })) ?? null;
}

/** A retry with the same clientKey is answered above, before this counts. */
const commentRateRule = (userId: string): RateRule => ({
  bucket: `comment:user:${userId}`,
  max: env().commentsPerMinute,
  windowMs: 60_000,
  message: "You have posted many comments in the last minute.",
});

export async function createThread(user: SessionUser, panelId: string, raw: z.infer<typeof newThreadInput>) {
  const manuscriptId = await manuscriptOfPanel(panelId);
  await authorize(user, "comment.write", manuscriptId);
  const input = newThreadInput.parse(raw);
  const again = await existingByClientKey(user, input.clientKey);
  if (again) return getThread(user, again.threadId);
  const [rev] = await getDb().select({ panelId: revisions.panelId }).from(revisions).where(eq(revisions.id, input.revisionId));
  if (!rev || rev.panelId !== panelId) throw badRequest("revisionId: not a revision of this panel.");
  if (input.anchor?.type === "xrange" && !(input.anchor.x0 < input.anchor.x1)) throw badRequest("anchor: x0 must be below x1.");
  const prepared = prepareCommentBody(input.body, await memberIds(manuscriptId));
  const id = newId();
  let raced = false;
  await getDb()
    .transaction(async (tx) => {
      await consumeRate([commentRateRule(user.id)], Date.now(), tx);
      await tx.insert(threads).values({ id, panelId, revisionId: input.revisionId, anchor: input.anchor ?? null, createdBy: user.id });
      if (!(await insertComment(tx, user, id, panelId, manuscriptId, prepared, input.body, input.clientKey))) {
        raced = true;
        tx.rollback(); // a concurrent retry stored this comment first: keep its thread, not an empty one
      }
    })
    .catch((err) => {
      if (!raced) throw err;
    });
  if (raced) return getThread(user, (await existingByClientKey(user, input.clientKey))!.threadId);
  deliverOutboxSoon();
  return getThread(user, id);
}

/** A reply; a retry with the same clientKey answers the comment stored the first time. */
export async function postReply(user: SessionUser, threadId: string, raw: z.infer<typeof replyInput>) {
  const { thread, manuscriptId } = await threadContext(threadId);
  await authorize(user, "comment.write", manuscriptId);
  const input = replyInput.parse(raw);
  const again = await existingByClientKey(user, input.clientKey);
  if (again) return ownCommentView(user, again);
  const prepared = prepareCommentBody(input.body, await memberIds(manuscriptId));
  const made = await getDb().transaction(async (tx) => {
    await consumeRate([commentRateRule(user.id)], Date.now(), tx);
    return insertComment(tx, user, threadId, thread.panelId, manuscriptId, prepared, input.body, input.clientKey);
  });
  deliverOutboxSoon();
  if (!made) return ownCommentView(user, (await existingByClientKey(user, input.clientKey))!); // a concurrent retry stored it first
  return ownCommentView(user, {
    id: made.id,
    threadId,
    body: input.body,
    html: prepared.html,
    mentions: prepared.mentions,
    createdAt: made.createdAt,
    editedAt: null,
  });
}

/** A reply answered with its whole thread. */
export async function replyToThread(user: SessionUser, threadId: string, raw: z.infer<typeof replyInput>) {
  await postReply(user, threadId, raw);
  return getThread(user, threadId);
}

/** One of the caller's own comments as a thread lists it, with its thread's id. */
function ownCommentView(
  user: SessionUser,
  c: { id: string; threadId: string; body: unknown; html: string; mentions: string[]; createdAt: Date; editedAt: Date | null },
) {
  return {
    id: c.id,
    threadId: c.threadId,
    body: c.body,
    html: c.html,
    mentions: c.mentions,
    createdBy: user.id,
    authorName: user.name,
    createdAt: c.createdAt,
    editedAt: c.editedAt,
  };
}

export async function setThreadResolved(user: SessionUser, threadId: string, resolved: boolean) {
  const { manuscriptId } = await threadContext(threadId);
  await authorize(user, "comment.write", manuscriptId);
  await getDb().transaction(async (tx) => {
    await tx
      .update(threads)
      .set(resolved ? { resolvedAt: new Date(), resolvedBy: user.id } : { resolvedAt: null, resolvedBy: null })
      .where(eq(threads.id, threadId));
    await appendAudit(tx, { actorId: user.id, manuscriptId, action: resolved ? "thread.resolve" : "thread.reopen", target: `thread:${threadId}` });
  });
  return getThread(user, threadId);
}

async function ownComment(user: SessionUser, commentId: string) {
  const [c] = await getDb().select().from(comments).where(eq(comments.id, commentId));
  if (!c || c.deletedAt) throw notFound();
  const { manuscriptId } = await threadContext(c.threadId);
  await authorize(user, "comment.write", manuscriptId);
  if (c.createdBy !== user.id) throw forbidden("Only the author of a comment may change it.");
  return { c, manuscriptId };
}

/** Edits within 15 minutes of posting; the previous text is kept in the edit history. */
export async function editComment(user: SessionUser, commentId: string, raw: z.infer<typeof editCommentInput>) {
  const { c, manuscriptId } = await ownComment(user, commentId);
  const input = editCommentInput.parse(raw);
  if (Date.now() - c.createdAt.getTime() > EDIT_WINDOW_MS) throw forbidden("Comments can be edited for 15 minutes after posting; reply instead.");
  if (input.baseEditedAt !== undefined && (c.editedAt?.getTime() ?? null) !== input.baseEditedAt)
    throw conflict("This comment was edited since you opened it. Reload to see the current text.");
  const prepared = prepareCommentBody(input.body, await memberIds(manuscriptId));
  await getDb().transaction(async (tx) => {
    await tx.insert(commentEdits).values({ id: newId(), commentId, body: c.body, html: c.html, replacedAt: new Date() });
    await tx
      .update(comments)
      .set({ body: input.body, html: prepared.html, mentions: prepared.mentions, editedAt: new Date() })
      .where(eq(comments.id, commentId));
    await appendAudit(tx, { actorId: user.id, manuscriptId, action: "comment.edit", target: `comment:${commentId}` });
  });
  return getThread(user, c.threadId);
}

/** Only the author, and only while nobody has replied after it. */
export async function deleteComment(user: SessionUser, commentId: string) {
  const { c, manuscriptId } = await ownComment(user, commentId);
  const later = await getDb().select({ id: comments.id, at: comments.createdAt }).from(comments).where(eq(comments.threadId, c.threadId));
  if (later.some((o) => o.id !== c.id && o.at >= c.createdAt)) throw conflict("Someone has replied, so this comment stays; edit it or reply instead.");
  await getDb().transaction(async (tx) => {
    await tx.update(comments).set({ deletedAt: new Date() }).where(eq(comments.id, commentId));
    await appendAudit(tx, { actorId: user.id, manuscriptId, action: "comment.delete", target: `comment:${commentId}` });
  });
  return { ok: true };
}

export { getThread, listThreads, manuscriptOfComment, manuscriptOfThread } from "./thread-reads";
