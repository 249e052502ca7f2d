"use client";
import { useQuery } from "@tanstack/react-query";
import {
  createColumnHelper,
  flexRender,
  getCoreRowModel,
  getFilteredRowModel,
  getSortedRowModel,
  useReactTable,
  type ColumnFiltersState,
  type FilterFn,
  type SortingState,
} from "@tanstack/react-table";
import Link from "next/link";
import { useState } from "react";
import { fetchJson } from "@/components/api-client";
import { SortHeader } from "@/components/data/sort-header";
import { EmptyState, Field } from "@/components/ui";
import { RelativeTime } from "./relative-time";
import { REVIEW_REFETCH_MS, reviewKeys, toTime, type QueueEntry } from "./review-api";
import { isReviewState, StateBadge, STATE_ORDER } from "./state-badge";

type Kind = QueueEntry["kind"];
const KIND_LABELS: Record<Kind, { label: string; shape: string }> = {
  review: { label: "Review", shape: "◎" },
  mention: { label: "Mention", shape: "@" },
  signoff: { label: "Sign-off", shape: "◆" },
  revise: { label: "Revise", shape: "✎" },
};
const KINDS = Object.keys(KIND_LABELS) as Kind[];

const hrefFor = (i: QueueEntry) => (i.panelId ? `/panels/${i.panelId}` : `/figures/${i.figureId}`);

const matchesText: FilterFn<QueueEntry> = (row, _columnId, value: string) => {
  const q = value.trim().toLowerCase();
  if (!q) return true;
  const i = row.original;
  return [i.what, i.manuscriptTitle, i.figureTitle, `figure ${i.figureNumber}`, i.letter ?? "", KIND_LABELS[i.kind].label].some((s) =>
    s.toLowerCase().includes(q),
  );
};

const col = createColumnHelper<QueueEntry>();
const columns = [
  col.accessor("what", {
    header: "What",
    cell: (c) => (
      <Link href={hrefFor(c.row.original)} className="font-medium text-accent underline-offset-2 hover:underline">
        {c.getValue()}
      </Link>
    ),
  }),
  col.accessor("kind", {
    header: "Kind",
    filterFn: "equals",
    sortingFn: (a, b) => KINDS.indexOf(a.original.kind) - KINDS.indexOf(b.original.kind),
    cell: (c) => (
      <span className="whitespace-nowrap">
        <span aria-hidden className="mr-1 inline-block w-3 text-center">
          {KIND_LABELS[c.getValue()].shape}
        </span>
        {KIND_LABELS[c.getValue()].label}
      </span>
    ),
  }),
  col.accessor("manuscriptTitle", {
    header: "Manuscript",
    cell: (c) => (
      <Link
        href={`/manuscripts/${c.row.original.manuscriptId}/status`}
        className="line-clamp-2 min-w-[12rem] hover:underline"
        title={`${c.getValue()} — open its figure status`}
      >
        {c.getValue()}
      </Link>
    ),
  }),
  col.accessor("figureNumber", {
    header: "Figure",
    meta: { numeric: true },
    sortDescFirst: false,
    cell: (c) => <span title={c.row.original.figureTitle}>Figure {c.getValue()}</span>,
  }),
  col.accessor((i) => i.letter ?? "", {
    id: "panel",
    header: "Panel",
    cell: (c) =>
      c.getValue() ? (
        <span className="font-semibold">{c.getValue()}</span>
      ) : (
        <span className="text-muted" title="the whole figure">
          —
        </span>
      ),
  }),
  col.accessor("state", {
    header: "State",
    sortingFn: (a, b) => rank(a.original.state) - rank(b.original.state),
    cell: (c) => <StateBadge state={c.getValue()} />,
  }),
  col.accessor((i) => toTime(i.since), {
    id: "since",
    header: "Since",
    cell: (c) => <RelativeTime at={c.getValue()} className="text-xs text-muted" />,
  }),
];

function rank(state: string) {
  return isReviewState(state) ? STATE_ORDER[state] : -1;
}

/** "Waiting on me": every panel, mention and sign-off across the caller's manuscripts, fresh on focus and every 30 s. */
export function ReviewQueue() {
  const { data, isPending, isFetching, error } = useQuery({
    queryKey: reviewKeys.queue,
    queryFn: () => fetchJson<{ items: QueueEntry[] }>("/api/review-queue").then((r) => r.items),
    refetchInterval: REVIEW_REFETCH_MS,
    refetchOnWindowFocus: true,
  });
  const [sorting, setSorting] = useState<SortingState>([{ id: "since", desc: false }]);
  const [columnFilters, setColumnFilters] = useState<ColumnFiltersState>([]);
  const [text, setText] = useState("");
  const table = useReactTable({
    data: data ?? [],
    columns,
    state: { sorting, columnFilters, globalFilter: text },
    onSortingChange: setSorting,
    onColumnFiltersChange: setColumnFilters,
    onGlobalFilterChange: setText,
    globalFilterFn: matchesText,
    getCoreRowModel: getCoreRowModel(),
    getSortedRowModel: getSortedRowModel(),
    getFilteredRowModel: getFilteredRowModel(),
  });
  const kind = (columnFilters.find((f) => f.id === "kind")?.value as Kind | undefined) ?? "";
  const counts = new Map<Kind, number>();
  for (const i of data ?? []) counts.set(i.kind, (counts.get(i.kind) ?? 0) + 1);

  if (isPending)
    return (
      <p className="text-sm text-muted" aria-busy>
        Loading what waits on you…
      </p>
    );
  if (error && !data)
    return (
      <p role="alert" className="text-sm text-bad">
        <span aria-hidden>✕ </span>Could not load the queue: {error.message}
      </p>
    );
  if (!data?.length) {
    return (
      <EmptyState title="Nothing waits on you.">
        Panels to review, threads that mention you and figures to sign off appear here as soon as they need you.
      </EmptyState>
    );
  }
  const rows = table.getRowModel().rows;
  return (
    <div>
      <div className="mb-3 flex flex-wrap items-end gap-3">
        <Field label="Kind">
          <select
            value={kind}
            onChange={(e) => table.getColumn("kind")!.setFilterValue(e.target.value || undefined)}
            className="rounded-sm border border-rule bg-white px-2.5 py-1.5 text-sm focus:border-accent"
          >
            <option value="">All kinds ({data.length})</option>
            {KINDS.map((k) => (
              <option key={k} value={k}>
                {KIND_LABELS[k].label} ({counts.get(k) ?? 0})
              </option>
            ))}
          </select>
        </Field>
        <div className="min-w-[16rem] flex-1 sm:max-w-sm">
          <Field label="Filter">
            <input
              type="search"
              value={text}
              onChange={(e) => setText(e.target.value)}
              placeholder="panel, figure, manuscript…"
              className="w-full rounded-sm border border-rule bg-white px-2.5 py-1.5 text-sm focus:border-accent"
            />
          </Field>
        </div>
        <span className="ml-auto pb-1.5 text-xs text-muted" aria-live="polite">
          {rows.length} of {data.length} shown{isFetching ? " · refreshing…" : error ? ` · ✕ could not refresh: ${error.message}` : ""}
        </span>
      </div>
      <div className="relative overflow-x-auto border border-rule bg-sheet">
        <table className="w-full text-sm">
          <caption className="sr-only">What waits on you; select a column heading to sort</caption>
          <thead className="bg-paper text-left text-xs uppercase tracking-wide text-muted">
            {table.getHeaderGroups().map((hg) => (
              <tr key={hg.id}>
                {hg.headers.map((h) => (
                  <SortHeader key={h.id} header={h} />
                ))}
              </tr>
            ))}
          </thead>
          <tbody>
            {rows.map((row) => (
              <tr key={row.id} className="border-t border-rule align-top hover:bg-paper/50" data-kind={row.original.kind}>
                {row.getVisibleCells().map((cell) => (
                  <td key={cell.id} className={`px-3 py-2 ${cell.column.columnDef.meta?.numeric ? "whitespace-nowrap text-right tabular" : ""}`}>
                    {flexRender(cell.column.columnDef.cell, cell.getContext())}
                  </td>
                ))}
              </tr>
            ))}
            {!rows.length ? (
              <tr>
                <td colSpan={columns.length} className="px-3 py-6 text-center text-muted">
                  Nothing matches these filters.
                </td>
              </tr>
            ) : null}
          </tbody>
        </table>
      </div>
    </div>
  );
}
