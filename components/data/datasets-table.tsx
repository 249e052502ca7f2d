"use client";
import { useQuery, useQueryClient } from "@tanstack/react-query";
import { createColumnHelper, flexRender, getCoreRowModel, getSortedRowModel, useReactTable, type SortingState } from "@tanstack/react-table";
import Link from "next/link";
import { Fragment, useState } from "react";
import { fetchJson } from "@/components/api-client";
import { EmptyState } from "@/components/ui";
import { ArchiveToggleButton, ShowArchivedToggle } from "@/components/archive/archive-controls";
import { formatBytes, formatCount, formatDate } from "@/lib/data/format";
import type { DatasetListItem } from "./api";
import { KIND_ORDER, kindLabel } from "./measurement-kinds";
import { SortHeader } from "./sort-header";

const col = createColumnHelper<DatasetListItem>();
const time = (d: Date | string) => new Date(d).getTime();

const columns = [
  col.accessor("name", {
    header: "Name",
    cell: (c) => (
      <Link href={`/datasets/${c.row.original.id}`} className="block min-w-[13rem] font-medium text-accent underline-offset-2 hover:underline">
        {c.getValue()}
      </Link>
    ),
  }),
  col.accessor("kind", {
    header: "Kind",
    cell: (c) => kindLabel(c.getValue()),
    sortingFn: (a, b) => KIND_ORDER[a.original.kind] - KIND_ORDER[b.original.kind] || a.original.name.localeCompare(b.original.name),
  }),
  col.accessor((d) => d.sample ?? "", { id: "sample", header: "Sample", cell: (c) => c.getValue() || <span className="text-muted">—</span> }),
  col.accessor(
    (d) =>
      Object.entries(d.tags ?? {})
        .map(([k, v]) => `${k}=${v}`)
        .join(" "),
    {
      id: "tags",
      header: "Tags",
      enableSorting: false,
      cell: (c) => (
        <ul className="flex flex-wrap gap-1">
          {Object.entries(c.row.original.tags ?? {}).map(([k, v]) => (
            <li key={k} className="rounded-sm border border-rule bg-paper px-1.5 py-px text-xs">
              {k}={v}
            </li>
          ))}
        </ul>
      ),
    },
  ),
  col.accessor("versionCount", { header: "Versions", cell: (c) => c.getValue(), meta: { numeric: true } }),
  col.accessor((d) => d.latestVersion?.rowCount ?? 0, {
    id: "latest",
    header: "Rows · size",
    meta: { numeric: true },
    cell: (c) => {
      const v = c.row.original.latestVersion;
      return v ? (
        <>
          {formatCount(v.rowCount)} · {formatBytes(v.byteSize)}
        </>
      ) : (
        "—"
      );
    },
  }),
  col.accessor((d) => time(d.latestVersion?.createdAt ?? d.createdAt), {
    id: "uploaded",
    header: "Last upload",
    cell: (c) => <span className="whitespace-nowrap text-xs text-muted">{formatDate(c.getValue())}</span>,
  }),
];

/** The manuscript's datasets, kept fresh through the API (uploads by colleagues and scripts show up on focus); "Show archived" lists the archived ones. */
export function DatasetsTable({ manuscriptId, initial, mayArchive = false }: { manuscriptId: string; initial: DatasetListItem[]; mayArchive?: boolean }) {
  const queryClient = useQueryClient();
  const [showArchived, setShowArchived] = useState(false);
  const { data, isFetching, error } = useQuery({
    queryKey: ["datasets", manuscriptId, ...(showArchived ? ["archived"] : [])],
    queryFn: () =>
      fetchJson<{ items: DatasetListItem[] }>(`/api/manuscripts/${manuscriptId}/datasets${showArchived ? "?archived=1" : ""}`).then((r) => r.items),
    initialData: showArchived ? undefined : initial,
  });
  const rows = data ?? [];
  const refresh = () => void queryClient.invalidateQueries({ queryKey: ["datasets", manuscriptId] });
  const shownColumns = mayArchive
    ? [
        ...columns,
        col.display({
          id: "archive",
          header: "Archive",
          cell: (c) => <ArchiveToggleButton kind="dataset" id={c.row.original.id} archived={showArchived} onDone={refresh} />,
        }),
      ]
    : columns;
  const toggle = (
    <p className="mb-2">
      <ShowArchivedToggle checked={showArchived} onChange={setShowArchived} />
    </p>
  );
  const [sorting, setSorting] = useState<SortingState>([{ id: "kind", desc: false }]);
  const groupedByKind = sorting[0]?.id === "kind";
  const kindCounts = new Map<string, number>();
  for (const d of rows) kindCounts.set(d.kind, (kindCounts.get(d.kind) ?? 0) + 1);
  const table = useReactTable({
    data: rows,
    columns: shownColumns,
    state: { sorting },
    onSortingChange: setSorting,
    getCoreRowModel: getCoreRowModel(),
    getSortedRowModel: getSortedRowModel(),
  });

  if (!rows.length) {
    return (
      <div>
        {toggle}
        {showArchived ? (
          <EmptyState title="No archived datasets" />
        ) : (
          <EmptyState title="No datasets yet">Measurement files uploaded here, or from a script, appear in this list with their versions.</EmptyState>
        )}
      </div>
    );
  }
  return (
    <div>
      {toggle}
      <div className="mb-2 flex flex-wrap items-baseline justify-between gap-2 text-xs text-muted">
        <span>
          {rows.length} {showArchived ? "archived " : ""}dataset{rows.length === 1 ? "" : "s"} · {groupedByKind ? "grouped by kind; " : ""}select a column
          heading to sort
        </span>
        <span aria-live="polite">{isFetching ? "Refreshing…" : error ? `✕ Could not refresh: ${error.message}` : ""}</span>
      </div>
      <div className="relative overflow-x-auto border border-rule bg-sheet">
        <table className="w-full text-sm">
          <caption className="sr-only">Datasets of this manuscript</caption>
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
            {table.getRowModel().rows.map((row, i, all) => {
              const startsGroup = groupedByKind && (i === 0 || all[i - 1].original.kind !== row.original.kind);
              return (
                <Fragment key={row.id}>
                  {startsGroup ? (
                    <tr className="border-t border-rule bg-paper/70">
                      <th scope="colgroup" colSpan={shownColumns.length} className="px-3 py-1.5 text-left text-xs font-semibold">
                        {kindLabel(row.original.kind)} <span className="font-normal text-muted">· {kindCounts.get(row.original.kind)}</span>
                      </th>
                    </tr>
                  ) : null}
                  <tr className="border-t border-rule align-top hover:bg-paper/50">
                    {row.getVisibleCells().map((cell) => (
                      <td key={cell.id} className={`px-3 py-2 ${cell.column.columnDef.meta?.numeric ? "text-right tabular" : ""}`}>
                        {flexRender(cell.column.columnDef.cell, cell.getContext())}
                      </td>
                    ))}
                  </tr>
                </Fragment>
              );
            })}
          </tbody>
        </table>
      </div>
    </div>
  );
}
