import "server-only";
import type { BoundInput } from "@/db/schema";
import { loadBoundData } from "./bindings";

type Row = Record<string, number | string | null>;
const DISPLAY_ROWS = 4000;

/**
 * Rows for the browser: short tables as they are; long ones reduced to the rows that hold the
 * minimum and maximum of every numeric column in each of ~2,000 x buckets (x = the first numeric
 * column, when sorted), so dips and spikes survive. Exports never use this.
 */
export function reduceRowsForDisplay(rows: Row[], buckets = DISPLAY_ROWS / 2): { rows: Row[]; reduced: boolean; sourceRows: number } {
  if (rows.length <= DISPLAY_ROWS) return { rows, reduced: false, sourceRows: rows.length };
  const numeric = Object.keys(rows[0] ?? {}).filter((k) => typeof rows[0][k] === "number");
  const xKey = numeric[0];
  const sorted = xKey !== undefined && rows.every((r, i) => i === 0 || (r[xKey] as number) >= (rows[i - 1][xKey] as number));
  if (!xKey || !sorted) {
    const step = Math.ceil(rows.length / DISPLAY_ROWS);
    return { rows: rows.filter((_, i) => i % step === 0), reduced: true, sourceRows: rows.length };
  }
  const keep = new Set<number>([0, rows.length - 1]);
  const x0 = rows[0][xKey] as number;
  const span = (rows.at(-1)![xKey] as number) - x0 || 1;
  let start = 0;
  for (let b = 0; b < buckets && start < rows.length; b++) {
    const hi = x0 + (span * (b + 1)) / buckets;
    let end = start;
    while (end < rows.length && (b === buckets - 1 || (rows[end][xKey] as number) <= hi)) end++;
    for (const k of numeric.slice(1)) {
      let lo = -1,
        hiI = -1;
      for (let i = start; i < end; i++) {
        const v = rows[i][k];
        if (typeof v !== "number") continue;
        if (lo < 0 || v < (rows[lo][k] as number)) lo = i;
        if (hiI < 0 || v > (rows[hiI][k] as number)) hiI = i;
      }
      if (lo >= 0) keep.add(lo);
      if (hiI >= 0) keep.add(hiI);
    }
    start = end;
  }
  return { rows: [...keep].sort((a, b) => a - b).map((i) => rows[i]), reduced: true, sourceRows: rows.length };
}

export async function displayDataFor(bound: Record<string, BoundInput>) {
  const full = await loadBoundData(bound);
  return Object.fromEntries(Object.entries(full).map(([name, rows]) => [name, reduceRowsForDisplay(rows)]));
}
