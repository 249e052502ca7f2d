/**
 * A parsed table as the records a figure binds: one object per row keyed by column name, with
 * non-finite numbers (missing cells) as null. Pure.
 */
import type { ParsedTable } from "./parse/types";

export type TableRow = Record<string, number | string | null>;

/** Every row, or only those whose `series` column holds `series` (the long-format files fits write). */
export function tableRows(table: Pick<ParsedTable, "columns" | "data" | "rowCount">, series?: string | null): TableRow[] {
  const names = table.columns.map((c) => c.name);
  const seriesCol = series ? names.indexOf("series") : -1;
  const rows: TableRow[] = [];
  for (let r = 0; r < table.rowCount; r++) {
    if (seriesCol >= 0 && table.data[seriesCol][r] !== series) continue;
    const row: TableRow = {};
    names.forEach((n, i) => {
      const val = table.data[i][r];
      row[n] = typeof val === "number" && !Number.isFinite(val) ? null : val;
    });
    rows.push(row);
  }
  return rows;
}
