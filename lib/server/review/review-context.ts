import "server-only";
import { asc, desc, eq, inArray } from "drizzle-orm";
import { getDb, type Executor } from "@/db/client";
import { decisions, figures, panels, revisions, signoffs, threads, users } from "@/db/schema";
import { figureReviewState, panelReviewState, type ReviewState } from "@/lib/review/derive-state";
import { letterFor } from "../figures/scope";
import { figureContentHash } from "../figures/figure-hash";

/**
 * Everything needed to derive review states for the figures of one manuscript (or one figure), in a
 * few queries; inside a transaction, pass it to see that transaction's own writes.
 */
export async function loadReviewContext(where: { manuscriptId?: string; figureId?: string }, db: Executor = getDb()) {
  const figs = await db
    .select()
    .from(figures)
    .where(where.figureId ? eq(figures.id, where.figureId) : eq(figures.manuscriptId, where.manuscriptId!))
    .orderBy(asc(figures.number));
  const figIds = figs.map((f) => f.id);
  const ps = figIds.length ? await db.select().from(panels).where(inArray(panels.figureId, figIds)).orderBy(asc(panels.position)) : [];
  const panelIds = ps.map((p) => p.id);
  const revIds = ps.map((p) => p.currentRevisionId).filter((x): x is string => Boolean(x));
  const [revs, decs, signs, threadRows] = await Promise.all([
    revIds.length ? db.select().from(revisions).where(inArray(revisions.id, revIds)) : [],
    panelIds.length
      ? db
          .select({ d: decisions, name: users.name })
          .from(decisions)
          .innerJoin(users, eq(users.id, decisions.userId))
          .where(inArray(decisions.panelId, panelIds))
          .orderBy(asc(decisions.createdAt))
      : [],
    figIds.length ? db.select().from(signoffs).where(inArray(signoffs.figureId, figIds)).orderBy(desc(signoffs.createdAt)) : [],
    panelIds.length ? db.select({ panelId: threads.panelId, resolvedAt: threads.resolvedAt }).from(threads).where(inArray(threads.panelId, panelIds)) : [],
  ]);

  return figs.map((f) => {
    const fPanels = ps.filter((p) => p.figureId === f.id);
    const figureHash = figureContentHash(
      f,
      fPanels.map((p, i) => ({
        letter: letterFor(i),
        colSpan: p.colSpan,
        contentHash: revs.find((r) => r.id === p.currentRevisionId)?.contentHash ?? null,
      })),
    );
    const figSignoffs = signs.filter((s) => s.figureId === f.id);
    const signedOff = figSignoffs.some((s) => s.figureHash === figureHash);
    const panelViews = fPanels.map((p, i) => {
      const rev = revs.find((r) => r.id === p.currentRevisionId) ?? null;
      const pDecs = decs.filter((d) => d.d.panelId === p.id);
      const st = panelReviewState({
        currentHash: rev?.contentHash ?? null,
        requiredReviewers: f.requiredReviewers,
        signedOff,
        decisions: pDecs.map(({ d }) => ({ userId: d.userId, decision: d.decision, contentHash: d.contentHash, createdAt: d.createdAt.getTime() })),
      });
      return {
        panel: p,
        letter: letterFor(i),
        revision: rev,
        ...st,
        decisions: pDecs.map(({ d, name }) => ({ ...d, userName: name, stale: d.contentHash !== rev?.contentHash })),
        openThreads: threadRows.filter((t) => t.panelId === p.id && !t.resolvedAt).length,
      };
    });
    const state: ReviewState = figureReviewState(
      panelViews.map((p) => p.state),
      signedOff,
    );
    return {
      figure: f,
      figureHash,
      state,
      panels: panelViews,
      signoffs: figSignoffs.map((s) => ({ ...s, stale: s.figureHash !== figureHash })),
    };
  });
}

export type FigureReview = Awaited<ReturnType<typeof loadReviewContext>>[number];
