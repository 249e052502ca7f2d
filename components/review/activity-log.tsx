"use client";
import { useQuery } from "@tanstack/react-query";
import { fetchJson } from "@/components/api-client";
import { EmptyState } from "@/components/ui";
import { shortHash } from "@/lib/data/format";
import { REVIEW_REFETCH_MS, reviewKeys, type ActivityEntry } from "./review-api";

const dayOf = (d: Date | string) => new Date(d).toISOString().slice(0, 10);
const timeOf = (d: Date | string) => new Date(d).toISOString().slice(11, 16);
const dayLabel = new Intl.DateTimeFormat("en-GB", { weekday: "long", day: "numeric", month: "long", year: "numeric", timeZone: "UTC" });

function groupByDay(items: ActivityEntry[]): Array<{ day: string; items: ActivityEntry[] }> {
  const groups: Array<{ day: string; items: ActivityEntry[] }> = [];
  for (const e of items) {
    const day = dayOf(e.at);
    const last = groups.at(-1);
    if (last?.day === day) last.items.push(e);
    else groups.push({ day, items: [e] });
  }
  return groups;
}

export function useActivity(manuscriptId: string, initial?: ActivityEntry[]) {
  return useQuery({
    queryKey: reviewKeys.activity(manuscriptId),
    queryFn: () => fetchJson<{ items: ActivityEntry[] }>(`/api/manuscripts/${manuscriptId}/activity`).then((r) => r.items),
    initialData: initial,
    refetchInterval: REVIEW_REFETCH_MS,
    refetchOnWindowFocus: true,
  });
}

/** The manuscript's audit log in words, newest first, one block per day (UTC). */
export function ActivityLog({ manuscriptId, initial }: { manuscriptId: string; initial: ActivityEntry[] }) {
  const { data, isFetching, error } = useActivity(manuscriptId, initial);
  const items = data ?? [];
  if (!items.length)
    return <EmptyState title="Nothing has happened yet">Uploads, analyses, revisions, comments, decisions and sign-offs are recorded here.</EmptyState>;
  return (
    <div>
      <p className="mb-3 text-xs text-muted" aria-live="polite">
        {items.length} entr{items.length === 1 ? "y" : "ies"}, newest first · times in UTC
        {isFetching ? " · refreshing…" : error ? ` · ✕ could not refresh: ${error.message}` : ""}
      </p>
      <div className="space-y-6">
        {groupByDay(items).map((g) => (
          <section key={g.day} aria-labelledby={`day-${g.day}`}>
            <h2 id={`day-${g.day}`} className="mb-2 text-sm font-semibold">
              <time dateTime={g.day}>{dayLabel.format(new Date(`${g.day}T00:00:00Z`))}</time>
            </h2>
            <ol className="divide-y divide-rule border border-rule bg-sheet">
              {g.items.map((e) => (
                <li
                  key={e.seq}
                  className="grid grid-cols-[3.5rem_1fr] gap-x-3 gap-y-1 px-4 py-2.5 text-sm sm:grid-cols-[3.5rem_1fr_auto]"
                  data-action={e.action}
                >
                  <time dateTime={new Date(e.at).toISOString()} className="pt-px text-xs text-muted tabular">
                    {timeOf(e.at)}
                  </time>
                  <p className="min-w-0 break-words">
                    <span className="font-medium">{e.actor}</span> {e.text}
                  </p>
                  <p className="col-start-2 text-xs text-muted sm:col-start-3 sm:text-right">
                    <span className="tabular">#{e.seq}</span>{" "}
                    <code className="rounded-sm bg-paper px-1 font-mono" title={`entry hash ${e.hash}`}>
                      {shortHash(e.hash)}
                    </code>
                  </p>
                </li>
              ))}
            </ol>
          </section>
        ))}
      </div>
    </div>
  );
}
