"use client";
import { flexRender, type Header, type RowData } from "@tanstack/react-table";

declare module "@tanstack/react-table" {
  // eslint-disable-next-line @typescript-eslint/no-unused-vars -- the augmented interface must repeat TanStack's type parameters
  interface ColumnMeta<TData extends RowData, TValue> {
    /** Right-aligned, tabular figures (heading and cells). */
    numeric?: boolean;
  }
}

/** A column heading that sorts on click or Enter; the direction is announced and drawn as ▲/▼, not coloured. */
export function SortHeader<T>({ header }: { header: Header<T, unknown> }) {
  const numeric = header.column.columnDef.meta?.numeric;
  const label = flexRender(header.column.columnDef.header, header.getContext());
  const align = numeric ? "text-right" : "text-left";
  if (!header.column.getCanSort())
    return (
      <th scope="col" className={`px-3 py-2 font-semibold ${align}`}>
        {label}
      </th>
    );
  const dir = header.column.getIsSorted();
  return (
    <th scope="col" className={`px-3 py-2 font-semibold ${align}`} aria-sort={dir === "asc" ? "ascending" : dir === "desc" ? "descending" : "none"}>
      <button type="button" onClick={header.column.getToggleSortingHandler()} className="inline-flex items-center gap-1 uppercase tracking-wide hover:text-ink">
        {label}
        <span aria-hidden className="w-3 text-[10px]">
          {dir === "asc" ? "▲" : dir === "desc" ? "▼" : "↕"}
        </span>
      </button>
    </th>
  );
}
