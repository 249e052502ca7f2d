import "server-only";
import { and, asc, eq, isNull, sql } from "drizzle-orm";
import type { Executor } from "@/db/client";
import { preparedQuery } from "@/db/prepared";
import { decisions, figures, manuscriptMembers, manuscripts, panels, threadFollows, type revisions } from "@/db/schema";
import type { SessionUser } from "@/lib/authz";
import { env } from "@/lib/env";
import { notify } from "../mail/notices";
import { letterFor } from "../figures/scope";
import type { FigureReview } from "./review-context";
import type { Change } from "./what-changed";

type Rev = typeof revisions.$inferSelect;

const id = sql.placeholder("id");
const panelPlaceRow = preparedQuery((db) =>
  db
    .select({ figure: figures, title: manuscripts.title, panelTitle: panels.title })
    .from(panels)
    .innerJoin(figures, eq(figures.id, panels.figureId))
    .innerJoin(manuscripts, eq(manuscripts.id, figures.manuscriptId))
    .where(eq(panels.id, id))
    .prepare(),
);
const panelsInOrder = preparedQuery((db) =>
  db
    .select({ id: panels.id })
    .from(panels)
    .where(and(eq(panels.figureId, id), isNull(panels.archivedAt)))
    .orderBy(asc(panels.position))
    .prepare(),
);
const figurePlaceRow = preparedQuery((db) =>
  db
    .select({ figure: figures, title: manuscripts.title })
    .from(figures)
    .innerJoin(manuscripts, eq(manuscripts.id, figures.manuscriptId))
    .where(eq(figures.id, id))
    .prepare(),
);
const memberRoles = preparedQuery((db) =>
  db.select({ userId: manuscriptMembers.userId, role: manuscriptMembers.role }).from(manuscriptMembers).where(eq(manuscriptMembers.manuscriptId, id)).prepare(),
);
/**
 * Everyone with a comment in the thread other than `commentId` that is not deleted: the authors
 * are walked one to the next on the (thread, author) index, so a long thread costs one seek per
 * person who wrote in it, not one row per comment.
 */
async function earlierWriters(tx: Executor, threadId: string, commentId: string): Promise<string[]> {
  const rows = await tx.all<{ author: string }>(sql`
    WITH RECURSIVE w(author) AS (
      SELECT (SELECT min(created_by) FROM comments WHERE thread_id = ${threadId})
      UNION ALL
      SELECT (SELECT min(created_by) FROM comments WHERE thread_id = ${threadId} AND created_by > w.author) FROM w WHERE w.author IS NOT NULL
    )
    SELECT author FROM w
    WHERE author IS NOT NULL
      AND EXISTS (SELECT 1 FROM comments c WHERE c.thread_id = ${threadId} AND c.created_by = w.author AND c.id <> ${commentId} AND c.deleted_at IS NULL)`);
  return rows.map((r) => r.author);
}
const followChoices = preparedQuery((db) => db.select().from(threadFollows).where(eq(threadFollows.threadId, id)).prepare());

/** Where a panel sits, read in the event's transaction: "Figure 2b", its manuscript and members. */
async function placeOfPanel(tx: Executor, panelId: string) {
  const row = (await panelPlaceRow(tx).get({ id: panelId }))!;
  const siblings = await panelsInOrder(tx).all({ id: row.figure.id });
  const letter = letterFor(siblings.findIndex((p) => p.id === panelId));
  return {
    figure: row.figure,
    manuscriptId: row.figure.manuscriptId,
    manuscriptTitle: row.title,
    label: `Figure ${row.figure.number}${letter}`,
    panelTitle: row.panelTitle,
    href: `${env().appUrl}/panels/${panelId}`,
  };
}

async function placeOfFigure(tx: Executor, figureId: string) {
  const row = (await figurePlaceRow(tx).get({ id: figureId }))!;
  return {
    figure: row.figure,
    manuscriptId: row.figure.manuscriptId,
    manuscriptTitle: row.title,
    label: `Figure ${row.figure.number}`,
    href: `${env().appUrl}/figures/${figureId}`,
  };
}

const members = (tx: Executor, manuscriptId: string) => memberRoles(tx).all({ id: manuscriptId });

const named = (title: string) => (title ? ` “${title}”` : "");

/**
 * A new revision of a panel: whoever approved the revision it replaces learns that the approval went
 * stale and what changed; the other expected reviewers (the figure's required reviewers, or every
 * reviewer when none is named) learn that a review is requested.
 */
export async function noticeNewRevision(tx: Executor, actor: SessionUser, rev: Rev, previous: Rev | null, changes: Change[]) {
  const place = await placeOfPanel(tx, rev.panelId);
  const people = await members(tx, place.manuscriptId);
  const isMember = (id: string) => people.some((m) => m.userId === id && m.role !== "viewer");
  const stale = new Set<string>();
  if (previous && previous.contentHash !== rev.contentHash) {
    const onPrevious = await tx
      .select()
      .from(decisions)
      .where(and(eq(decisions.panelId, rev.panelId), eq(decisions.contentHash, previous.contentHash)))
      .orderBy(asc(decisions.createdAt));
    const latest = new Map(onPrevious.map((d) => [d.userId, d.decision]));
    for (const [userId, decision] of latest) if (decision === "approved" && isMember(userId)) stale.add(userId);
  }
  const common = { actorId: actor.id, manuscriptId: place.manuscriptId, figureId: place.figure.id, manuscriptTitle: place.manuscriptTitle, href: place.href };
  if (stale.size)
    await notify(tx, {
      ...common,
      kind: "approval_stale",
      to: [...stale],
      headline: `Your approval of ${place.label} went stale`,
      lines: [
        `${actor.name} saved revision ${rev.number} of ${place.label}${named(place.panelTitle)}; your approval of revision ${previous!.number} no longer counts.`,
        `What changed: ${changes.length ? changes.map((c) => c.text).join("; ") : "the content hash"}.`,
        ...(rev.message ? [`Revision note: ${rev.message}`] : []),
        "Review the new revision to approve it again.",
      ],
    });
  // A draft asks nobody: reviewers hear of it when its author sends it to review.
  const [panel] = await tx.select({ reviewRequestedAt: panels.reviewRequestedAt }).from(panels).where(eq(panels.id, rev.panelId));
  if (!panel?.reviewRequestedAt) return;
  await noticeReviewRequest(tx, actor, rev, { place, people, skip: stale, saved: true });
}

/**
 * Review requested of the expected reviewers (the figure's required reviewers, or every reviewer
 * when none is named): when a panel in review gets a new revision, and when its author sends a draft to review.
 */
export async function noticeReviewRequest(
  tx: Executor,
  actor: SessionUser,
  rev: Rev,
  o: { place?: Awaited<ReturnType<typeof placeOfPanel>>; people?: Awaited<ReturnType<typeof members>>; skip?: Set<string>; saved: boolean },
) {
  const place = o.place ?? (await placeOfPanel(tx, rev.panelId));
  const people = o.people ?? (await members(tx, place.manuscriptId));
  const isMember = (id: string) => people.some((m) => m.userId === id && m.role !== "viewer");
  const required = place.figure.requiredReviewers;
  const expected = required.length ? required.filter(isMember) : people.filter((m) => m.role === "reviewer").map((m) => m.userId);
  await notify(tx, {
    actorId: actor.id,
    manuscriptId: place.manuscriptId,
    figureId: place.figure.id,
    manuscriptTitle: place.manuscriptTitle,
    href: place.href,
    kind: "review_requested",
    to: expected.filter((id) => !o.skip?.has(id)),
    headline: `Review requested: ${place.label}`,
    lines: [
      o.saved
        ? `${actor.name} saved revision ${rev.number} of ${place.label}${named(place.panelTitle)}; it waits for your review.`
        : `${actor.name} sent ${place.label}${named(place.panelTitle)} (revision ${rev.number}) to review; it waits for your review.`,
      ...(rev.message ? [`Revision note: ${rev.message}`] : []),
    ],
  });
}

/**
 * A decision on a revision: its author learns of the approval or the request for a revision; when
 * it was the last approval the figure needed, the PI learns that the figure waits for sign-off.
 */
export async function noticeDecision(
  tx: Executor,
  actor: SessionUser,
  rev: Rev,
  decision: "approved" | "needs_revision",
  note: string,
  figure: { before: FigureReview; after: FigureReview },
) {
  const place = await placeOfPanel(tx, rev.panelId);
  const common = { actorId: actor.id, manuscriptId: place.manuscriptId, figureId: place.figure.id, manuscriptTitle: place.manuscriptTitle, href: place.href };
  const noteLine = note ? [`Note: ${note}`] : [];
  if (decision === "needs_revision")
    await notify(tx, {
      ...common,
      kind: "needs_revision",
      to: [rev.createdBy],
      headline: `${place.label} needs revision`,
      lines: [`${actor.name} asked for a revision of ${place.label}${named(place.panelTitle)} (revision ${rev.number}).`, ...noteLine],
    });
  else
    await notify(tx, {
      ...common,
      kind: "approved",
      to: [rev.createdBy],
      headline: `${place.label} approved by ${actor.name}`,
      lines: [`${actor.name} approved revision ${rev.number} of ${place.label}${named(place.panelTitle)}.`, ...noteLine],
    });
  if (figure.after.state === "approved" && figure.before.state !== "approved") {
    const fig = await placeOfFigure(tx, place.figure.id);
    const pis = (await members(tx, place.manuscriptId)).filter((m) => m.role === "pi").map((m) => m.userId);
    await notify(tx, {
      ...common,
      kind: "signoff_due",
      to: pis,
      href: fig.href,
      headline: `${fig.label} is ready for sign-off`,
      lines: [`Every panel of ${fig.label}${named(fig.figure.title)} is approved (the last by ${actor.name}); it waits for your sign-off.`],
    });
  }
}

/** A figure signed off: every member learns of it. */
export async function noticeSignoff(tx: Executor, actor: SessionUser, figureId: string, reason: string) {
  const fig = await placeOfFigure(tx, figureId);
  await notify(tx, {
    kind: "signed_off",
    to: (await members(tx, fig.manuscriptId)).map((m) => m.userId),
    actorId: actor.id,
    manuscriptId: fig.manuscriptId,
    figureId,
    manuscriptTitle: fig.manuscriptTitle,
    href: fig.href,
    headline: `${fig.label} signed off`,
    lines: [`${actor.name} signed off ${fig.label}${named(fig.figure.title)}.`, ...(reason ? [`Reason given for open issues: ${reason}`] : [])],
  });
}

/**
 * A comment: whoever it mentions learns of the mention; everyone else who wrote in the thread
 * before, or follows it, learns of the reply, unless they stopped following it. The link opens
 * the panel at the thread.
 */
export async function noticeComment(
  tx: Executor,
  actor: SessionUser,
  c: { id: string; threadId: string; panelId: string; mentions: string[]; excerpt: string },
) {
  const place = await placeOfPanel(tx, c.panelId);
  const common = {
    actorId: actor.id,
    manuscriptId: place.manuscriptId,
    figureId: place.figure.id,
    manuscriptTitle: place.manuscriptTitle,
    href: `${place.href}#thread-${c.threadId}`,
    lines: [`${actor.name} wrote on ${place.label}${named(place.panelTitle)}:`, `“${c.excerpt}”`],
  };
  await notify(tx, { ...common, kind: "mention", to: c.mentions, headline: `${actor.name} mentioned you on ${place.label}` });
  // Everyone who wrote in the thread before (one row each, however long the thread).
  const writers = await earlierWriters(tx, c.threadId, c.id);
  const people = new Set((await members(tx, place.manuscriptId)).map((m) => m.userId));
  const choices = await followChoices(tx).all({ id: c.threadId });
  const stopped = new Set(choices.filter((f) => !f.following).map((f) => f.userId));
  const followers = choices.filter((f) => f.following).map((f) => f.userId);
  const to = [...writers, ...followers].filter((id) => people.has(id) && !stopped.has(id) && !c.mentions.includes(id));
  await notify(tx, { ...common, kind: "reply", to, headline: `${actor.name} replied on ${place.label}` });
}
