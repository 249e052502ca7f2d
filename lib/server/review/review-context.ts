import "server-only";
import { and, asc, desc, eq, inArray, isNotNull, isNull, sql } from "drizzle-orm";
import { getDb, type Executor } from "@/db/client";
import { preparedQuery } from "@/db/prepared";
import { decisions, figures, panels, revisions, signoffs, threads, users } from "@/db/schema";
import { figureReviewState, panelReviewState, type ReviewState } from "@/lib/review/derive-state";
import { letterFor } from "../figures/scope";
import { figureContentHash } from "../figures/figure-hash";

/**
 * Which decisions a review context carries: every one ever made (the figure page's history), or
 * only each person's latest on each panel's current content (all that review states need; the
 * board and the queue read this, so their cost does not grow with a long review history).
 */
type DecisionHistory = "all" | "latest-on-current";

function allDecisions(db: Executor, panelIds: string[]) {
  return db
    .select({ d: decisions, name: users.name })
    .from(decisions)
    .innerJoin(users, eq(users.id, decisions.userId))
    .where(inArray(decisions.panelId, panelIds))
    .orderBy(asc(decisions.createdAt), sql`${decisions}.rowid`);
}

/**
 * Each person's latest decision (by time, then by insertion) on each panel's current content hash.
 * Who has decided on a panel is found by walking the decisions_latest index from one person to
 * the next (a recursive skip over user ids), and each one's latest decision on the current hash is
 * one seek in it, so the cost grows with the people deciding, not with how often they have.
 */
async function latestDecisionsOnCurrent(db: Executor, panelIds: string[]) {
  const list = sql.join(
    panelIds.map((id) => sql`${id}`),
    sql`, `,
  );
  const latest = await db.all<{ id: string | null }>(sql`
    WITH RECURSIVE deciders(panel_id, user_id) AS (
      SELECT p.id, (SELECT min(d.user_id) FROM decisions d WHERE d.panel_id = p.id) FROM panels p WHERE p.id IN (${list})
      UNION ALL
      SELECT k.panel_id, (SELECT min(d.user_id) FROM decisions d WHERE d.panel_id = k.panel_id AND d.user_id > k.user_id)
      FROM deciders k WHERE k.user_id IS NOT NULL
    )
    SELECT (
      SELECT d.id FROM decisions d
      WHERE d.panel_id = k.panel_id AND d.user_id = k.user_id AND d.content_hash = r.content_hash
      ORDER BY d.created_at DESC, d.rowid DESC LIMIT 1
    ) AS id
    FROM deciders k
    JOIN panels p ON p.id = k.panel_id
    JOIN revisions r ON r.id = p.current_revision_id
    WHERE k.user_id IS NOT NULL`);
  const ids = latest.map((r) => r.id).filter((id): id is string => id !== null);
  if (!ids.length) return [];
  return db
    .select({ d: decisions, name: users.name })
    .from(decisions)
    .innerJoin(users, eq(users.id, decisions.userId))
    .where(inArray(decisions.id, ids))
    .orderBy(asc(decisions.createdAt), sql`${decisions}.rowid`);
}

// One figure's rows (a decision reads them in its transaction) come from queries built once.
const figureById = preparedQuery((db) =>
  db
    .select()
    .from(figures)
    .where(eq(figures.id, sql.placeholder("id")))
    .prepare(),
);
const panelsOfFigure = preparedQuery((db) =>
  db
    .select()
    .from(panels)
    .where(and(eq(panels.figureId, sql.placeholder("id")), isNull(panels.archivedAt)))
    .orderBy(asc(panels.position))
    .prepare(),
);
const signoffsOfFigure = preparedQuery((db) =>
  db
    .select()
    .from(signoffs)
    .where(eq(signoffs.figureId, sql.placeholder("id")))
    .orderBy(desc(signoffs.createdAt))
    .prepare(),
);

/** The rows review states are derived from (deriveReviews), for a manuscript's figures or one figure. */
export async function loadReviewRows(
  where: { manuscriptId?: string; figureId?: string; archived?: boolean },
  db: Executor = getDb(),
  history: DecisionHistory = "all",
) {
  // A manuscript's figures leave out archived ones (or, asked for, list only those); one figure is found either way.
  const figs = where.figureId
    ? await figureById(db).all({ id: where.figureId })
    : await db
        .select()
        .from(figures)
        .where(and(eq(figures.manuscriptId, where.manuscriptId!), where.archived ? isNotNull(figures.archivedAt) : isNull(figures.archivedAt)))
        .orderBy(asc(figures.number));
  const figIds = figs.map((f) => f.id);
  const one = figIds.length === 1 ? { id: figIds[0] } : null;
  // An archived panel has left its figure: no letter, no part of the figure hash or state.
  const ps = one
    ? await panelsOfFigure(db).all(one)
    : figIds.length
      ? await db
          .select()
          .from(panels)
          .where(and(inArray(panels.figureId, figIds), isNull(panels.archivedAt)))
          .orderBy(asc(panels.position))
      : [];
  const panelIds = ps.map((p) => p.id);
  const revIds = ps.map((p) => p.currentRevisionId).filter((x): x is string => Boolean(x));
  const [revs, decs, signs, threadRows] = await Promise.all([
    revIds.length ? db.select().from(revisions).where(inArray(revisions.id, revIds)) : [],
    panelIds.length ? (history === "all" ? allDecisions(db, panelIds) : latestDecisionsOnCurrent(db, panelIds)) : [],
    one
      ? signoffsOfFigure(db).all(one)
      : figIds.length
        ? db.select().from(signoffs).where(inArray(signoffs.figureId, figIds)).orderBy(desc(signoffs.createdAt))
        : [],
    panelIds.length ? db.select({ panelId: threads.panelId, resolvedAt: threads.resolvedAt }).from(threads).where(inArray(threads.panelId, panelIds)) : [],
  ]);
  return { figs, ps, revs, decs, signs, threadRows };
}

export type ReviewRows = Awaited<ReturnType<typeof loadReviewRows>>;

/**
 * Everything needed to derive review states for the figures of one manuscript (or one figure), in a
 * few queries; inside a transaction, pass it to see that transaction's own writes.
 */
export async function loadReviewContext(
  where: { manuscriptId?: string; figureId?: string; archived?: boolean },
  db: Executor = getDb(),
  history: DecisionHistory = "all",
) {
  return deriveReviews(await loadReviewRows(where, db, history));
}

/** Figures with their panels' and their own review states, from rows already read. */
export function deriveReviews({ figs, ps, revs, decs, signs, threadRows }: ReviewRows) {
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
    // A withdrawn sign-off stays on record but no longer counts.
    const signedOff = figSignoffs.some((s) => s.figureHash === figureHash && !s.withdrawnAt);
    const panelViews = fPanels.map((p, i) => {
      const rev = revs.find((r) => r.id === p.currentRevisionId) ?? null;
      const pDecs = decs.filter((d) => d.d.panelId === p.id);
      const st = panelReviewState({
        currentHash: rev?.contentHash ?? null,
        requiredReviewers: f.requiredReviewers,
        signedOff,
        reviewRequested: p.reviewRequestedAt != null,
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
      signoffs: figSignoffs.map((s) => ({ ...s, stale: s.figureHash !== figureHash, withdrawn: s.withdrawnAt != null })),
    };
  });
}

export type FigureReview = ReturnType<typeof deriveReviews>[number];
