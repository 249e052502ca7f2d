/** The rows check: the rows each panel was drawn from against those read again from its file or fit report. */
import "server-only";
import { storedParameters, parameterRows } from "@/lib/figures/fit-value";
import type { ParsedTable } from "@/lib/data/parse";
import { tableOf, tableOfRows, type RowTable, type TableRow } from "@/lib/data/table-rows";
import { SERIES } from "../../figures/bindings";
import type { BundlePanelData } from "../bundle-layout";
import { type VerifyRow, fitReport } from "./common";

/** The first difference between the recorded rows and the rows read again, or null when they are identical. */
export function firstRowDifference(recorded: RowTable, actual: RowTable): string | null {
  if (recorded.length !== actual.length) return `recorded ${recorded.length} rows, re-read ${actual.length}`;
  const names = [...new Set([...recorded.names, ...actual.names])];
  const at = (t: RowTable) => {
    const column = new Map(t.names.map((n, j) => [n, j]));
    return (i: number, k: string) => {
      const j = column.get(k);
      return j === undefined ? null : t.cell(i, j);
    };
  };
  const [mine, theirs] = [at(recorded), at(actual)];
  for (let i = 0; i < recorded.length; i++) {
    for (const k of names) {
      const [a, b] = [mine(i, k), theirs(i, k)];
      if (!Object.is(a, b)) return `row ${i + 1}, ${k}: recorded ${JSON.stringify(a)}, re-read ${JSON.stringify(b)}`;
    }
  }
  return null;
}

/**
 * The recorded columns as a table, or why they cannot be read as one. Bundles made before the data
 * files were written column by column hold a list of records (`rows`), read as they are.
 */
function recordedTable(b: { columns?: unknown; values?: unknown; rows?: unknown }): RowTable | string {
  if (b.columns === undefined && Array.isArray(b.rows)) {
    const rows = b.rows as unknown[];
    if (!rows.every((r) => r !== null && typeof r === "object" && !Array.isArray(r))) return "its rows are not a list of records";
    return tableOfRows(rows as TableRow[]);
  }
  const { columns, values } = b;
  if (!Array.isArray(columns) || !columns.every((c) => typeof c === "string")) return "its columns are not a list of names";
  if (!Array.isArray(values) || values.length !== columns.length || !values.every(Array.isArray))
    return `its values are not one list per column (${columns.length} columns)`;
  const cols = values as unknown[][];
  const length = cols[0]?.length ?? 0;
  if (cols.some((c) => c.length !== length)) return "its columns hold different numbers of rows";
  return { names: columns, length, cell: (i, j) => (cols[j][i] ?? null) as number | string | null };
}

/**
 * One bound name's recorded rows against the rows read again from its file (or fit report). The table
 * to draw from: the one read again when they match, else the recorded one.
 */
export function boundRows(
  item: string,
  b: Omit<BundlePanelData["data"][string], "columns" | "values"> & { columns?: unknown; values?: unknown; rows?: unknown },
  tables: Map<string, ParsedTable>,
  files: Record<string, Uint8Array>,
): { row: VerifyRow; table: RowTable } {
  const read = recordedTable(b);
  const recorded = typeof read === "string" ? tableOfRows([]) : read;
  if (typeof read === "string") return { row: { item, check: "rows", match: false, detail: `the recorded rows cannot be read: ${read}` }, table: recorded };
  let actual: RowTable;
  let source: string;
  if (b.output === "parameters") {
    const report = fitReport(files, b.fit ?? "");
    if (typeof report === "string") return { row: { item, check: "rows", match: false, detail: report }, table: recorded };
    actual = tableOfRows(parameterRows(report.model, storedParameters(report.result)));
    source = `the parameters of ${b.fit}`;
  } else {
    const table = tables.get(b.file);
    if (!table) return { row: { item, check: "rows", match: false, detail: `${b.file} was not parsed` }, table: recorded };
    actual = tableOf(table, b.output ? SERIES[b.output] : null);
    source = b.output ? `the ${b.output} rows of ${b.file}` : b.file;
  }
  const diff = firstRowDifference(recorded, actual);
  return diff
    ? { row: { item, check: "rows", match: false, detail: `${diff} (from ${source})` }, table: recorded }
    : { row: { item, check: "rows", match: true, detail: `${actual.length} rows identical to ${source}` }, table: actual };
}
