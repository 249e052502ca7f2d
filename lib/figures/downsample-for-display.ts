/**
 * Prepares a long series for the browser (never for exports or source data): min and max of y
 * per pixel column, so the drawn envelope equals the full data and every dip or spike survives
 * (see lib/data/downsample.ts), with values rounded to what a screen can show and the result
 * kept under a JSON byte budget. Columnar output ({ x: [...], y: [...] }) is about half the size
 * of row objects; `toRows` turns it into Vega rows on the client.
 */
import { lttb, minMaxPerBucket, type Series } from "@/lib/data/downsample";

export interface DisplaySeries {
  x: number[];
  y: number[];
  /** Points in the input (NaN rows included). */
  sourcePoints: number;
  /** Pixel columns used (0 when the input was returned unchanged). */
  columns: number;
  method: "none" | "min-max" | "lttb";
  /** Length of JSON.stringify({ x, y }) in bytes. */
  bytes: number;
}

export interface DisplayOptions {
  /** Pixel columns of the widest display (CSS px × device pixel ratio); default 2000. */
  columns?: number;
  /** JSON budget in bytes; default 200 000. Columns are halved until the result fits. */
  maxBytes?: number;
  /**
   * Minimum significant digits kept (default 6); more are kept where an axis' offset is large
   * against its span, so rounding always stays below 1/20 of a pixel column.
   */
  digits?: number;
  /** "min-max" (default) for dense traces; "lttb" for a fixed point count that follows the shape. */
  method?: "min-max" | "lttb";
}

const round = (v: number, digits: number): number => (Number.isFinite(v) ? Number(v.toPrecision(digits)) : v);

/** Significant digits that resolve span / (columns · 20) at the axis' largest magnitude. */
function digitsFor(values: ArrayLike<number>, columns: number, minimum: number): number {
  let lo = Infinity;
  let hi = -Infinity;
  for (let i = 0; i < values.length; i++) {
    const v = values[i];
    if (v < lo) lo = v;
    if (v > hi) hi = v;
  }
  const span = hi - lo;
  const magnitude = Math.max(Math.abs(lo), Math.abs(hi));
  if (!(span > 0) || !Number.isFinite(magnitude) || magnitude === 0) return minimum;
  const needed = Math.ceil(Math.log10(magnitude / (span / (columns * 20)))) + 1;
  return Math.min(17, Math.max(minimum, needed));
}

function jsonBytes(x: number[], y: number[]): number {
  // Digits and punctuation are ASCII, so the string length is the byte count.
  return JSON.stringify({ x, y }).length;
}

function isSorted(x: ArrayLike<number>): boolean {
  for (let i = 1; i < x.length; i++) if (x[i] < x[i - 1]) return false;
  return true;
}

/** x ascending (a stable sort of the pairs) when the input is not already. */
function sortedPairs(x: ArrayLike<number>, y: ArrayLike<number>): { x: ArrayLike<number>; y: ArrayLike<number> } {
  if (isSorted(x)) return { x, y };
  const idx = Array.from({ length: Math.min(x.length, y.length) }, (_, i) => i).sort((a, b) => x[a] - x[b] || a - b);
  return { x: Float64Array.from(idx, (i) => x[i]), y: Float64Array.from(idx, (i) => y[i]) };
}

/**
 * A display version of (x, y). Series already small enough are returned as they are (rounded);
 * longer ones become min/max per pixel column (x order kept), halving the columns until the
 * JSON fits `maxBytes`.
 */
export function prepareSeriesForDisplay(x: ArrayLike<number>, y: ArrayLike<number>, options: DisplayOptions = {}): DisplaySeries {
  const maxBytes = options.maxBytes ?? 200_000;
  const minDigits = options.digits ?? 6;
  const method = options.method ?? "min-max";
  const n = Math.min(x.length, y.length);
  let columns = Math.max(1, Math.floor(options.columns ?? 2000));
  const sorted = sortedPairs(x, y);

  const dx = digitsFor(sorted.x, columns, minDigits);
  const dy = digitsFor(sorted.y, columns, minDigits);
  if (n <= 2 * columns) {
    const rx = Array.from({ length: n }, (_, i) => round(sorted.x[i], dx));
    const ry = Array.from({ length: n }, (_, i) => round(sorted.y[i], dy));
    const bytes = jsonBytes(rx, ry);
    if (bytes <= maxBytes) return { x: rx, y: ry, sourcePoints: n, columns: 0, method: "none", bytes };
  }
  for (;;) {
    const s: Series = method === "lttb" ? lttb(sorted.x, sorted.y, 2 * columns) : minMaxPerBucket(sorted.x, sorted.y, columns);
    const rx = s.x.map((v) => round(v, dx));
    const ry = s.y.map((v) => round(v, dy));
    const bytes = jsonBytes(rx, ry);
    if (bytes <= maxBytes || columns <= 16) return { x: rx, y: ry, sourcePoints: n, columns, method, bytes };
    columns = Math.floor(columns / 2);
  }
}

/** Row objects for Vega from a columnar display series. */
export function toRows(series: Pick<DisplaySeries, "x" | "y">, xField: string, yField: string): Array<Record<string, number>> {
  return series.x.map((xv, i) => ({ [xField]: xv, [yField]: series.y[i] }));
}
