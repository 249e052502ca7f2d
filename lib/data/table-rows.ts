/**
 * A parsed table as the rows a figure binds, without making an object per row: a RowTable reads
 * cells straight from the parsed columns (optionally only the rows of one `series`), so a
 * million-row binding can be written out or reduced for display while holding only its columns.
 * Missing numbers (non-finite) read as null. Pure.
 */
import type { ParsedTable } from "./parse/types";

type Cell = number | string | null;
export type TableRow = Record<string, Cell>;

export interface RowTable {
  /** Column names, in file order. */
  readonly names: readonly string[];
  /** Rows. */
  readonly length: number;
  /** The cell of row `i`, column `j`. */
  cell(i: number, j: number): Cell;
}

/** The table's rows, or only those whose `series` column holds `series` (the long-format files fits write). */
export function tableOf(table: Pick<ParsedTable, "columns" | "data" | "rowCount">, series?: string | null): RowTable {
  const names = table.columns.map((c) => c.name);
  const data = table.data;
  const seriesCol = series ? names.indexOf("series") : -1;
  let index: Uint32Array | null = null;
  if (seriesCol >= 0) {
    const picked: number[] = [];
    for (let r = 0; r < table.rowCount; r++) if (data[seriesCol][r] === series) picked.push(r);
    index = Uint32Array.from(picked);
  }
  return {
    names,
    length: index ? index.length : table.rowCount,
    cell(i, j) {
      const v = data[j][index ? index[i] : i];
      return typeof v === "number" && !Number.isFinite(v) ? null : v;
    },
  };
}

/** Rows already held as records (fitted parameters, an older bundle's JSON): every key any row has is a column, in order of first appearance; a key a row lacks reads as null. */
export function tableOfRows(rows: readonly TableRow[]): RowTable {
  const keys = new Set<string>();
  for (const row of rows) for (const k of Object.keys(row)) keys.add(k);
  const names = [...keys];
  return { names, length: rows.length, cell: (i, j) => rows[i][names[j]] ?? null };
}

/** Row `i` as a record keyed by column name. */
export function rowAt(t: RowTable, i: number): TableRow {
  const row: TableRow = {};
  t.names.forEach((n, j) => {
    row[n] = t.cell(i, j);
  });
  return row;
}

/** Every row as a record (what Vega and the comparisons take; holds an object per row). */
export function allRows(t: RowTable): TableRow[] {
  return Array.from({ length: t.length }, (_, i) => rowAt(t, i));
}

/** Every row of a parsed table as records, or only those of one `series`. */
export function tableRows(table: Pick<ParsedTable, "columns" | "data" | "rowCount">, series?: string | null): TableRow[] {
  return allRows(tableOf(table, series));
}
