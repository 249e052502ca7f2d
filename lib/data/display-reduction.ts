/**
 * Rows for the screen: short tables as they are; long ones reduced to the rows that hold the minimum
 * and maximum of every numeric column in each of ~2,000 x buckets (x = the first numeric column,
 * when sorted), so dips and spikes survive. Reads cells through a RowTable and makes records only
 * for the rows it keeps. Exports of source data never use this. Pure.
 */
import { allRows, rowAt, type RowTable, type TableRow } from "./table-rows";

const DISPLAY_ROWS = 4000;

export function reduceForDisplay(t: RowTable, buckets = DISPLAY_ROWS / 2): { rows: TableRow[]; reduced: boolean; sourceRows: number } {
  const n = t.length;
  if (n <= DISPLAY_ROWS) return { rows: allRows(t), reduced: false, sourceRows: n };
  const numeric = t.names.flatMap((_, j) => (typeof t.cell(0, j) === "number" ? [j] : []));
  const x = numeric[0];
  const xAt = (i: number) => t.cell(i, x) as number;
  let sorted = x !== undefined;
  for (let i = 1; sorted && i < n; i++) sorted = xAt(i) >= xAt(i - 1);
  if (!sorted) {
    const step = Math.ceil(n / DISPLAY_ROWS);
    const kept: TableRow[] = [];
    for (let i = 0; i < n; i += step) kept.push(rowAt(t, i));
    return { rows: kept, reduced: true, sourceRows: n };
  }
  const keep = new Set<number>([0, n - 1]);
  const x0 = xAt(0);
  const span = xAt(n - 1) - x0 || 1;
  let start = 0;
  for (let b = 0; b < buckets && start < n; b++) {
    const hi = x0 + (span * (b + 1)) / buckets;
    let end = start;
    while (end < n && (b === buckets - 1 || xAt(end) <= hi)) end++;
    for (const j of numeric.slice(1)) {
      let lo = -1,
        hiI = -1,
        loV = 0,
        hiV = 0;
      for (let i = start; i < end; i++) {
        const v = t.cell(i, j);
        if (typeof v !== "number") continue;
        if (lo < 0 || v < loV) [lo, loV] = [i, v];
        if (hiI < 0 || v > hiV) [hiI, hiV] = [i, v];
      }
      if (lo >= 0) keep.add(lo);
      if (hiI >= 0) keep.add(hiI);
    }
    start = end;
  }
  return { rows: [...keep].sort((a, b) => a - b).map((i) => rowAt(t, i)), reduced: true, sourceRows: n };
}
