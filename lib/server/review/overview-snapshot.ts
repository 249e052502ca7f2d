import "server-only";
import { count, eq } from "drizzle-orm";
import { getDb, type Database } from "@/db/client";
import { datasets } from "@/db/schema";
import { dataWarningCounts } from "../figures/figures";
import { listMembers } from "../manuscripts";
import { loadReviewContext, type FigureReview } from "./review-context";

/** What a manuscript's overview and the review queue read, the same for every member (roles are applied after). */
export interface OverviewSnapshot {
  reviews: FigureReview[];
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
  const [reviews, members, [dataCount]] = await Promise.all([
    loadReviewContext({ manuscriptId }, undefined, "latest-on-current"),
    listMembers(manuscriptId),
    getDb().select({ n: count() }).from(datasets).where(eq(datasets.manuscriptId, manuscriptId)),
  ]);
  return { reviews, warningCounts: await dataWarningCounts(reviews), members, datasetCount: dataCount?.n ?? 0 };
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

/**
 * After a committed write that changed one figure and raised the stamp from `from` to `to`, with
 * that figure's review as of `to` derived in the write's own transaction: a kept overview as of
 * exactly `from` becomes the overview as of `to` without reading it all again. Nothing else changed
 * between the two stamps (writes are serial and every one the overview reads raises the stamp),
 * so the rest of it stands. Any other case is left to the next read.
 */
export function amendOverview(manuscriptId: string, from: number, to: number, figure: FigureReview): void {
  const cache = cacheOfDb();
  const entry = cache.get(manuscriptId);
  if (!entry?.loaded || entry.stamp !== from || to !== from + 1) return;
  const { loaded } = entry;
  if (!loaded.reviews.some((r) => r.figure.id === figure.figure.id)) return;
  const amended: OverviewSnapshot = { ...loaded, reviews: loaded.reviews.map((r) => (r.figure.id === figure.figure.id ? figure : r)) };
  cache.set(manuscriptId, { stamp: to, snapshot: Promise.resolve(amended), loaded: amended });
}
