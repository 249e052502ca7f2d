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

/**
 * The overview of a manuscript as of `stamp`, its `review_stamp` read by the caller before asking.
 * Triggers raise the stamp in the same transaction as any write the overview depends on, so an
 * entry kept under the stamp the caller read is never older than that read; a newer entry serves
 * too. Requests that miss together share one load. Callers must not change what they get.
 */
export function overviewSnapshot(manuscriptId: string, stamp: number): Promise<OverviewSnapshot> {
  const db = getDb();
  let cache = caches.get(db);
  if (!cache) caches.set(db, (cache = new Map<string, Entry>()));
  const hit = cache.get(manuscriptId);
  if (hit && hit.stamp >= stamp) return hit.snapshot;
  const snapshot = loadSnapshot(manuscriptId);
  cache.delete(manuscriptId);
  if (cache.size >= MAX_MANUSCRIPTS) cache.delete(cache.keys().next().value!);
  const entry = { stamp, snapshot };
  cache.set(manuscriptId, entry);
  // A failed load is not kept: the next request tries again.
  snapshot.catch(() => {
    if (cache.get(manuscriptId) === entry) cache.delete(manuscriptId);
  });
  return snapshot;
}
