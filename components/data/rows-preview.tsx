"use client";
import { keepPreviousData, useQuery } from "@tanstack/react-query";
import { flexRender, getCoreRowModel, useReactTable, type ColumnDef, type PaginationState } from "@tanstack/react-table";
import { useMemo, useState } from "react";
import { fetchJson } from "@/components/api-client";
import { Button } from "@/components/ui";
import { formatCount } from "@/lib/data/format";
import type { RowsPage, VersionView } from "./api";

type Row = Array<number | string | null>;
const PAGE_SIZE = 50;

function Cell({ value }: { value: number | string | null }) {
  if (value === null)
    return (
      <span className="text-muted" title="missing">
        —
      </span>
    );
  return <>{String(value)}</>;
}

/** The parsed rows of one version, fetched page by page from the server (never the whole file at once). */
export function RowsPreview({ version }: { version: VersionView }) {
  const [pagination, setPagination] = useState<PaginationState>({ pageIndex: 0, pageSize: PAGE_SIZE });
  const offset = pagination.pageIndex * pagination.pageSize;
  const { data, isFetching, isError, error } = useQuery({
    queryKey: ["rows", version.id, offset, pagination.pageSize],
    queryFn: () => fetchJson<RowsPage>(`/api/versions/${version.id}/rows?offset=${offset}&limit=${pagination.pageSize}`),
    placeholderData: keepPreviousData,
    staleTime: Infinity, // a version never changes
  });
  const columns = useMemo<Array<ColumnDef<Row>>>(
    () =>
      version.columns.map((c, i) => ({
        id: `${i}`,
        header: () => (
          <>
            {c.name}
            {c.unit ? <span className="font-normal normal-case text-muted"> ({c.unit})</span> : null}
          </>
        ),
        accessorFn: (row) => row[i],
        cell: (ctx) => <Cell value={ctx.getValue() as number | string | null} />,
      })),
    [version.columns],
  );
  const rowCount = version.rowCount;
  const table = useReactTable({
    data: data?.rows ?? [],
    columns,
    rowCount,
    state: { pagination },
    onPaginationChange: setPagination,
    manualPagination: true,
    getCoreRowModel: getCoreRowModel(),
  });
  const first = rowCount ? offset + 1 : 0;
  const last = Math.min(offset + pagination.pageSize, rowCount);

  return (
    <div>
      <div className="relative overflow-x-auto border border-rule bg-sheet" aria-busy={isFetching}>
        <table className="w-full text-sm">
          <caption className="sr-only">
            Rows {first} to {last} of version {version.number}
          </caption>
          <thead className="bg-paper text-xs uppercase tracking-wide text-muted">
            {table.getHeaderGroups().map((hg) => (
              <tr key={hg.id}>
                <th scope="col" className="px-3 py-2 text-right">
                  #
                </th>
                {hg.headers.map((h) => (
                  <th key={h.id} scope="col" className="whitespace-nowrap px-3 py-2 text-right">
                    {flexRender(h.column.columnDef.header, h.getContext())}
                  </th>
                ))}
              </tr>
            ))}
          </thead>
          <tbody className={`divide-y divide-rule ${isFetching ? "opacity-60" : ""}`}>
            {table.getRowModel().rows.map((row) => (
              <tr key={row.id}>
                <td className="px-3 py-1 text-right text-xs text-muted tabular">{(data?.offset ?? 0) + row.index + 1}</td>
                {row.getVisibleCells().map((cell) => (
                  <td key={cell.id} className="whitespace-nowrap px-3 py-1 text-right tabular">
                    {flexRender(cell.column.columnDef.cell, cell.getContext())}
                  </td>
                ))}
              </tr>
            ))}
          </tbody>
        </table>
      </div>
      {isError ? (
        <p role="alert" className="mt-2 text-sm text-bad">
          <span aria-hidden>✕ </span>
          {error.message}
        </p>
      ) : null}
      <nav aria-label="Pages of rows" className="mt-2 flex flex-wrap items-center gap-2 text-sm">
        <Button type="button" variant="quiet" onClick={() => table.firstPage()} disabled={!table.getCanPreviousPage()} aria-label="First page">
          « First
        </Button>
        <Button type="button" variant="quiet" onClick={() => table.previousPage()} disabled={!table.getCanPreviousPage()} aria-label="Previous page">
          ‹ Previous
        </Button>
        <Button type="button" variant="quiet" onClick={() => table.nextPage()} disabled={!table.getCanNextPage()} aria-label="Next page">
          Next ›
        </Button>
        <Button type="button" variant="quiet" onClick={() => table.lastPage()} disabled={!table.getCanNextPage()} aria-label="Last page">
          Last »
        </Button>
        <span className="ml-1 tabular" aria-live="polite" data-testid="rows-range">
          rows {formatCount(first)}–{formatCount(last)} of {formatCount(rowCount)}
          {isFetching ? <span className="text-muted"> · loading…</span> : null}
        </span>
        <span className="ml-auto text-xs text-muted">
          page {pagination.pageIndex + 1} of {formatCount(Math.max(1, table.getPageCount()))}
        </span>
      </nav>
    </div>
  );
}
