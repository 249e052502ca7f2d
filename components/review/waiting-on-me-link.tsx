"use client";
import { useQuery } from "@tanstack/react-query";
import Link from "next/link";
import { usePathname } from "next/navigation";
import { fetchJson } from "@/components/api-client";
import { REVIEW_REFETCH_MS, reviewKeys, type QueueEntry } from "./review-api";

/**
 * The nav link to the review queue, with how many things wait (shares its cache with the queue page).
 * `compact` (the phone bar beside the menu button): only the count, and nothing when nothing waits.
 */
export function WaitingOnMeLink({ compact = false }: { compact?: boolean }) {
  const here = usePathname() === "/review";
  const { data } = useQuery({
    queryKey: reviewKeys.queue,
    queryFn: () => fetchJson<{ items: QueueEntry[] }>("/api/review-queue").then((r) => r.items),
    refetchInterval: REVIEW_REFETCH_MS,
  });
  const n = data?.length ?? 0;
  if (compact)
    return n > 0 ? (
      <Link href="/review" aria-current={here ? "page" : undefined} className="inline-flex items-center gap-1 whitespace-nowrap hover:underline">
        <span className="rounded-full bg-accent px-1.5 py-px text-[11px] font-semibold leading-4 text-white tabular">{n}</span> waiting
        <span className="sr-only"> on me</span>
      </Link>
    ) : null;
  return (
    <Link href="/review" aria-current={here ? "page" : undefined} className="inline-flex items-center gap-1.5 hover:underline">
      Waiting on me
      {n > 0 ? (
        <span className="rounded-full bg-accent px-1.5 py-px text-[11px] font-semibold leading-4 text-white tabular" data-testid="waiting-count">
          {n}
          <span className="sr-only"> {n === 1 ? "item" : "items"}</span>
        </span>
      ) : null}
    </Link>
  );
}
