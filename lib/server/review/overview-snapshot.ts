import "server-only";
import { count, eq } from "drizzle-orm";
import { getDb, type Database } from "@/db/client";
import { datasets } from "@/db/schema";
import { dataWarningCounts } from "../figures/figures";
import { listMembers } from "../manuscripts";
import { deriveReviews, loadReviewRows, type FigureReview, type ReviewRows } from "./review-context";

/** What a manuscript's overview and the review queue read, the same for every member (roles are applied after). */
export interface OverviewSnapshot {
  reviews: FigureReview[];
  /** The rows the reviews were derived from. */
  rows: ReviewRows;
  warningCounts: Map<string, number>;
  members: Awaited<ReturnType<typeof listMembers>>;
  datasetCount: number;
}

interface Entry {
  stamp: number;
  snapshot: Promise<OverviewSnapshot>;
  /** Set once the load has finished. */
  loaded?: OverviewSnapshot;
}

const MAX_MANUSCRIPTS = 500;
/** Per database handle, so a test or a restore that opens another database starts empty. */
const caches = new WeakMap<Database, Map<string, Entry>>();

async function loadSnapshot(manuscriptId: string): Promise<OverviewSnapshot> {
  const [rows, members, [dataCount]] = await Promise.all([
    loadReviewRows({ manuscriptId }, undefined, "latest-on-current"),
    listMembers(manuscriptId),
    getDb().select({ n: count() }).from(datasets).where(eq(datasets.manuscriptId, manuscriptId)),
  ]);
  const reviews = deriveReviews(rows);
  return { reviews, rows, warningCounts: await dataWarningCounts(reviews), members, datasetCount: dataCount?.n ?? 0 };
}

/** Data warnings that could not be worked out (a stored file unreadable for a moment) are left out of the counts. */
function warningsComplete(s: OverviewSnapshot): boolean {
  return s.reviews.every((r) => r.panels.every((p) => !p.revision || s.warningCounts.has(p.revision.id)));
}

/**
 * The overview of a manuscript as of `stamp`, its `review_stamp` read by the caller before asking.
 * Triggers raise the stamp in the same transaction as any write the overview depends on, so an
 * entry kept under the stamp the caller read is never older than that read; a newer entry serves
 * too. Requests that miss together share one load. Callers must not change what they get.
 */
function cacheOfDb(): Map<string, Entry> {
  const db = getDb();
  let cache = caches.get(db);
  if (!cache) caches.set(db, (cache = new Map<string, Entry>()));
  return cache;
}

export function overviewSnapshot(manuscriptId: string, stamp: number): Promise<OverviewSnapshot> {
  const cache = cacheOfDb();
  const hit = cache.get(manuscriptId);
  if (hit && hit.stamp >= stamp) return hit.snapshot;
  const snapshot = loadSnapshot(manuscriptId);
  cache.delete(manuscriptId);
  if (cache.size >= MAX_MANUSCRIPTS) cache.delete(cache.keys().next().value!);
  const entry: Entry = { stamp, snapshot };
  cache.set(manuscriptId, entry);
  // A failed load is not kept: the next request tries again.
  snapshot.then(
    (loaded) => {
      entry.loaded = loaded;
      // Not kept without every panel's data warnings: the next read tries them again.
      if (!warningsComplete(loaded) && cache.get(manuscriptId) === entry) cache.delete(manuscriptId);
    },
    () => {
      if (cache.get(manuscriptId) === entry) cache.delete(manuscriptId);
    },
  );
  return snapshot;
}

/** One figure's part of a manuscript's rows, as loadReviewRows reads it for that figure alone. */
function figurePart(rows: ReviewRows, figureId: string): ReviewRows | null {
  const figs = rows.figs.filter((f) => f.id === figureId);
  if (!figs.length) return null;
  const ps = rows.ps.filter((p) => p.figureId === figureId);
  const panelIds = new Set(ps.map((p) => p.id));
  const revIds = new Set(ps.map((p) => p.currentRevisionId));
  return {
    figs,
    ps,
    revs: rows.revs.filter((r) => revIds.has(r.id)),
    decs: rows.decs.filter(({ d }) => panelIds.has(d.panelId)),
    signs: rows.signs.filter((x) => x.figureId === figureId),
    threadRows: rows.threadRows.filter((t) => panelIds.has(t.panelId)),
  };
}

/**
 * One figure's review rows from the kept overview, when it is the overview as of exactly `stamp`
 * (read by the caller inside its transaction, so they are that transaction's rows); null otherwise
 * (none kept, another stamp, or an archived figure the overview leaves out). Not to be changed.
 */
export function keptFigureRows(manuscriptId: string, stamp: number, figureId: string): ReviewRows | null {
  const entry = cacheOfDb().get(manuscriptId);
  if (!entry?.loaded || entry.stamp !== stamp) return null;
  return figurePart(entry.loaded.rows, figureId);
}

/**
 * After a committed write that changed one figure and raised the stamp from `from` to `to`, with
 * that figure's rows and review as of `to` derived in the write's own transaction: a kept overview
 * as of exactly `from` becomes the overview as of `to` without reading it all again. Nothing else
 * changed between the two stamps (writes are serial and every one the overview reads raises the
 * stamp), so the rest of it stands. Any other case is left to the next read.
 */
export function amendOverview(manuscriptId: string, from: number, to: number, figure: FigureReview, figureRows: ReviewRows): void {
  const cache = cacheOfDb();
  const entry = cache.get(manuscriptId);
  if (!entry?.loaded || entry.stamp !== from || to !== from + 1) return;
  const { loaded } = entry;
  const id = figure.figure.id;
  if (!loaded.reviews.some((r) => r.figure.id === id)) return;
  const panelIds = new Set(figureRows.ps.map((p) => p.id));
  const rows: ReviewRows = { ...loaded.rows, decs: [...loaded.rows.decs.filter(({ d }) => !panelIds.has(d.panelId)), ...figureRows.decs] };
  const amended: OverviewSnapshot = { ...loaded, rows, reviews: loaded.reviews.map((r) => (r.figure.id === id ? figure : r)) };
  cache.set(manuscriptId, { stamp: to, snapshot: Promise.resolve(amended), loaded: amended });
}
