import "server-only";
import { and, asc, eq, inArray, isNull } from "drizzle-orm";
import { z } from "zod";
import { getDb } from "@/db/client";
import { comments, panels, revisions, signoffs, threads } from "@/db/schema";
import { authorize, type SessionUser } from "@/lib/authz";
import { badRequest, conflict, notFound } from "@/lib/errors";
import { appendAudit } from "../audit";
import { manuscriptOfFigure, manuscriptOfPanel } from "../figures/scope";
import { commentExcerpt } from "./comment-body";
import type { FigureReview } from "./review-context";
import { noticeReviewRequest } from "./review-notices";

export const withdrawSignoffInput = z.object({
  signoffId: z.string().min(1, "signoffId is required").max(128),
  reason: z.string().trim().min(1, "Say why the sign-off is withdrawn.").max(5000),
});

/**
 * A draft goes to review when its author sends it: from then on reviewers are asked (the
 * review-requested notice, their "waiting on me" queue) and decisions on it count.
 */
export async function sendToReview(user: SessionUser, panelId: string) {
  const manuscriptId = await manuscriptOfPanel(panelId);
  await authorize(user, "figure.edit", manuscriptId);
  const at = new Date();
  await getDb().transaction(async (tx) => {
    const [p] = await tx.select().from(panels).where(eq(panels.id, panelId));
    if (p.archivedAt) throw conflict("This panel is archived; restore it before sending it to review.");
    if (!p.currentRevisionId) throw badRequest("The panel has no revision yet; save one before sending it to review.");
    if (p.reviewRequestedAt) throw conflict("This panel is already in review.");
    await tx.update(panels).set({ reviewRequestedAt: at }).where(eq(panels.id, panelId));
    const [rev] = await tx.select().from(revisions).where(eq(revisions.id, p.currentRevisionId));
    await appendAudit(tx, {
      actorId: user.id,
      manuscriptId,
      action: "panel.send_to_review",
      target: `panel:${panelId}`,
      data: { revisionId: rev.id, number: rev.number },
    });
    await noticeReviewRequest(tx, user, rev, { saved: false });
  });
  return { panelId, reviewRequestedAt: at.toISOString() };
}

export interface OpenIssue {
  panelId: string;
  letter: string;
  state: string;
  threads: Array<{ id: string; excerpt: string }>;
}

/** What stands between a figure and a clean sign-off: panels not approved and open threads (with the first comment's words). */
export async function openIssuesOf(review: FigureReview): Promise<{ lines: string[]; issues: OpenIssue[] }> {
  const panelIds = review.panels.map((p) => p.panel.id);
  const rows = panelIds.length
    ? await getDb()
        .select({ threadId: threads.id, panelId: threads.panelId, html: comments.html })
        .from(threads)
        .innerJoin(comments, eq(comments.threadId, threads.id))
        .where(and(inArray(threads.panelId, panelIds), isNull(threads.resolvedAt), isNull(comments.deletedAt)))
        .orderBy(asc(threads.createdAt), asc(comments.createdAt))
    : [];
  const firstWords = new Map<string, { panelId: string; excerpt: string }>();
  for (const r of rows) if (!firstWords.has(r.threadId)) firstWords.set(r.threadId, { panelId: r.panelId, excerpt: commentExcerpt(r.html, 120) });
  const issues: OpenIssue[] = [];
  const lines: string[] = [];
  for (const p of review.panels) {
    const open = [...firstWords].filter(([, t]) => t.panelId === p.panel.id).map(([id, t]) => ({ id, excerpt: t.excerpt }));
    if (p.state === "approved" && !open.length) continue;
    issues.push({ panelId: p.panel.id, letter: p.letter, state: p.state, threads: open });
    if (p.state !== "approved") lines.push(`panel ${p.letter} is ${p.state.replace("_", " ")}`);
    for (const t of open) lines.push(`panel ${p.letter} has an open thread: “${t.excerpt}”`);
  }
  return { lines, issues };
}

/** The PI withdraws a sign-off with a reason: it stays on record, marked withdrawn, and no longer counts anywhere. */
export async function withdrawSignoff(user: SessionUser, figureId: string, raw: z.infer<typeof withdrawSignoffInput>) {
  const manuscriptId = await manuscriptOfFigure(figureId);
  await authorize(user, "figure.signoff", manuscriptId);
  const input = withdrawSignoffInput.parse(raw);
  const at = new Date();
  await getDb().transaction(async (tx) => {
    const [s] = await tx.select().from(signoffs).where(eq(signoffs.id, input.signoffId));
    if (!s || s.figureId !== figureId) throw notFound();
    if (s.withdrawnAt) throw conflict("This sign-off was already withdrawn.");
    await tx.update(signoffs).set({ withdrawnAt: at, withdrawnBy: user.id, withdrawReason: input.reason }).where(eq(signoffs.id, s.id));
    await appendAudit(tx, {
      actorId: user.id,
      manuscriptId,
      action: "figure.signoff_withdraw",
      target: `figure:${figureId}`,
      data: { signoffId: s.id, figureHash: s.figureHash, reason: input.reason },
    });
  });
  return { id: input.signoffId, figureId, withdrawnAt: at.toISOString(), withdrawReason: input.reason };
}
