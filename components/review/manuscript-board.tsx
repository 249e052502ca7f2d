"use client";
import { useQuery } from "@tanstack/react-query";
import { useMemo } from "react";
import { fetchJson } from "@/components/api-client";
import { EmptyState } from "@/components/ui";
import { roleAllows } from "@/lib/authz/policy";
import { useActivity } from "./activity-log";
import { BoardFigureRow } from "./board-figure";
import { latestByTarget } from "./last-activity";
import { REVIEW_REFETCH_MS, reviewKeys, type ActivityEntry, type ManuscriptView } from "./review-api";
import { StateBadge, StateLegend } from "./state-badge";

/** Every figure and panel of a manuscript with its review state, kept fresh on focus and every 30 s. */
export function ManuscriptBoard({ initial, initialActivity }: { initial: ManuscriptView; initialActivity: ActivityEntry[] }) {
  const {
    data: m,
    isFetching,
    error,
  } = useQuery({
    queryKey: reviewKeys.manuscript(initial.id),
    queryFn: () => fetchJson<ManuscriptView>(`/api/manuscripts/${initial.id}`),
    initialData: initial,
    refetchInterval: REVIEW_REFETCH_MS,
    refetchOnWindowFocus: true,
  });
  const activity = useActivity(initial.id, initialActivity).data;
  const names = useMemo(() => new Map(m.members.map((p) => [p.userId, p.name])), [m.members]);
  const byTarget = useMemo(() => latestByTarget(activity ?? []), [activity]);
  const counts = new Map<string, number>();
  for (const f of m.figures) counts.set(f.reviewState, (counts.get(f.reviewState) ?? 0) + 1);
  const warned = m.figures.reduce((n, f) => n + f.panels.filter((p) => p.dataWarnings > 0).length, 0);

  return (
    <div className="space-y-4">
      <div className="rounded-sm border border-rule bg-sheet px-4 py-3">
        <h2 className="sr-only">States</h2>
        <StateLegend />
        <p className="mt-2 text-xs text-muted">
          Approvals and sign-offs bind to content hashes: when a panel changes, earlier decisions stay visible as stale and the state falls back to in review.
        </p>
      </div>
      <section aria-label="Figures and panels" className="min-w-0">
        <p className="mb-2 flex flex-wrap items-center gap-2 text-xs text-muted" aria-live="polite">
          <span>
            {m.figures.length} figure{m.figures.length === 1 ? "" : "s"}
          </span>
          {[...counts.entries()].map(([s, n]) => (
            <span key={s} className="inline-flex items-center gap-1">
              {n} × <StateBadge state={s} />
            </span>
          ))}
          <span data-testid="data-warning-count" className={warned ? "font-medium text-warn" : ""}>
            {warned ? <span aria-hidden>△ </span> : null}
            {warned} panel{warned === 1 ? "" : "s"} with data warnings
          </span>
          <span className="ml-auto">{isFetching ? "refreshing…" : error ? `✕ could not refresh: ${error.message}` : ""}</span>
        </p>
        {m.figures.length ? (
          <ul className="rounded-sm border border-rule bg-paper/60 px-4" aria-label="Figures">
            {m.figures.map((f) => (
              <BoardFigureRow key={f.id} f={f} names={names} byTarget={byTarget} isPi={roleAllows(m.role, "figure.signoff")} />
            ))}
          </ul>
        ) : (
          <EmptyState title="No figures yet">Figures and their panels appear here with their review state as soon as an author creates them.</EmptyState>
        )}
      </section>
    </div>
  );
}
