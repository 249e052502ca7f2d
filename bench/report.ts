/** Small helpers shared by the benchmarks: a compact text table and the summary statistics. */

/** Prints rows as a left-aligned table; the first row is the header. */
export function printTable(rows: Array<Array<string | number>>): void {
  const cells = rows.map((r) => r.map(String));
  const widths = cells[0]!.map((_, j) => Math.max(...cells.map((r) => (r[j] ?? "").length)));
  const line = (r: string[]) =>
    r
      .map((c, j) => c.padEnd(widths[j]!))
      .join("  ")
      .trimEnd();
  console.log(line(cells[0]!));
  console.log(widths.map((w) => "-".repeat(w)).join("  "));
  for (const r of cells.slice(1)) console.log(line(r));
}

/** Median of the values (mean of the two middle ones for an even count). */
export function median(values: number[]): number {
  const s = [...values].sort((a, b) => a - b);
  const m = s.length >> 1;
  return s.length % 2 ? s[m]! : (s[m - 1]! + s[m]!) / 2;
}

/** Nearest-rank percentile (p in 0…100). */
export function percentile(values: number[], p: number): number {
  const s = [...values].sort((a, b) => a - b);
  return s[Math.min(s.length - 1, Math.max(0, Math.ceil((p / 100) * s.length) - 1))]!;
}

export const round = (v: number, digits = 1): number => Number(v.toFixed(digits));
