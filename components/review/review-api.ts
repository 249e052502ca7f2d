import type { Wire } from "@/components/api-client";
import type { manuscriptActivity } from "@/lib/server/review/activity";
import type { QueueItem } from "@/lib/server/review/queue";
import type { getManuscript } from "@/lib/server/manuscripts";

export type QueueEntry = QueueItem;
export type ManuscriptView = Wire<Awaited<ReturnType<typeof getManuscript>>>;
export type BoardFigure = ManuscriptView["figures"][number];
export type BoardPanel = BoardFigure["panels"][number];
export type ActivityEntry = Wire<Awaited<ReturnType<typeof manuscriptActivity>>[number]>;

/** The review pages refresh on focus and on this interval, so decisions by co-authors show up unasked. */
export const REVIEW_REFETCH_MS = 30_000;

export const reviewKeys = {
  queue: ["review-queue"] as const,
  manuscript: (id: string) => ["manuscript", id] as const,
  activity: (id: string) => ["activity", id] as const,
};

export const toTime = (d: Date | string | number) => new Date(d).getTime();
