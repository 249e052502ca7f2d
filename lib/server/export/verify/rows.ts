/** The rows check: the rows each panel was drawn from against those read again from its file or fit report. */
import "server-only";
import { storedParameters, parameterRows } from "@/lib/figures/fit-value";
import type { ParsedTable } from "@/lib/data/parse";
import { tableOf, tableOfRows, type RowTable, type TableRow } from "@/lib/data/table-rows";
import { SERIES } from "../../figures/bindings";
import { type BundlePanelData } from "../bundle-layout";
import { type VerifyRow, fitReport } from "./common";

/** The first difference between the recorded rows and the rows read again, or null when they are identical. */
export function firstRowDifference(recorded: TableRow[], actual: RowTable): string | null {
  if (recorded.length !== actual.length) return `recorded ${recorded.length} rows, re-read ${actual.length}`;
  const column = new Map(actual.names.map((n, j) => [n, j]));
  for (let i = 0; i < recorded.length; i++) {
    for (const k of new Set([...Object.keys(recorded[i]), ...actual.names])) {
      const j = column.get(k);
      const again = j === undefined ? null : actual.cell(i, j);
      if (!Object.is(recorded[i][k] ?? null, again)) return `row ${i + 1}, ${k}: recorded ${JSON.stringify(recorded[i][k])}, re-read ${JSON.stringify(again)}`;
    }
  }
  return null;
}

/**
 * One bound name's recorded rows against the rows read again from its file (or fit report). The table
 * to draw from: the one read again when they match (held as columns), else the recorded rows.
 */
export function boundRows(
  item: string,
  b: Omit<BundlePanelData["data"][string], "rows"> & { rows?: unknown },
  tables: Map<string, ParsedTable>,
  files: Record<string, Uint8Array>,
): { row: VerifyRow; table: RowTable } {
  const recordedRows = Array.isArray(b.rows) ? (b.rows as TableRow[]) : [];
  const recorded = () => tableOfRows(recordedRows);
  let actual: RowTable;
  let source: string;
  if (b.output === "parameters") {
    const report = fitReport(files, b.fit ?? "");
    if (typeof report === "string") return { row: { item, check: "rows", match: false, detail: report }, table: recorded() };
    actual = tableOfRows(parameterRows(report.model, storedParameters(report.result)));
    source = `the parameters of ${b.fit}`;
  } else {
    const table = tables.get(b.file);
    if (!table) return { row: { item, check: "rows", match: false, detail: `${b.file} was not parsed` }, table: recorded() };
    actual = tableOf(table, b.output ? SERIES[b.output] : null);
    source = b.output ? `the ${b.output} rows of ${b.file}` : b.file;
  }
  const diff = firstRowDifference(recordedRows, actual);
  return diff
    ? { row: { item, check: "rows", match: false, detail: `${diff} (from ${source})` }, table: recorded() }
    : { row: { item, check: "rows", match: true, detail: `${actual.length} rows identical to ${source}` }, table: actual };
}
