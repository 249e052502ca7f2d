/** Axis arithmetic for the quick plot: data range → ticks → pixels. */

export interface Scale { domain: [number, number]; ticks: number[]; toPx: (v: number) => number; log: boolean }

export function extent(values: ReadonlyArray<number | null>, positiveOnly = false): [number, number] | null {
  let lo = Infinity;
  let hi = -Infinity;
  for (const v of values) {
    if (v === null || !Number.isFinite(v) || (positiveOnly && v <= 0)) continue;
    if (v < lo) lo = v;
    if (v > hi) hi = v;
  }
  return lo <= hi ? [lo, hi] : null;
}

/** Round steps of 1, 2 or 5 × 10ⁿ, about `count` of them across the range. */
export function niceTicks(lo: number, hi: number, count = 6): number[] {
  const span = hi - lo;
  const raw = span / count;
  const mag = 10 ** Math.floor(Math.log10(raw));
  const step = [1, 2, 5, 10].map((m) => m * mag).find((s) => span / s <= count) ?? 10 * mag;
  const out: number[] = [];
  for (let t = Math.ceil(lo / step) * step; t <= hi + step * 1e-9; t += step) out.push(Number(t.toPrecision(12)));
  return out;
}

/** Decades, with 2 and 5 in between when the range spans fewer than three of them. */
export function logTicks(lo: number, hi: number): number[] {
  const first = Math.floor(Math.log10(lo));
  const last = Math.ceil(Math.log10(hi));
  const mults = last - first < 3 ? [1, 2, 5] : [1];
  const out: number[] = [];
  for (let e = first; e <= last; e++) for (const m of mults) {
    const t = Number((m * 10 ** e).toPrecision(12));
    if (t >= lo * (1 - 1e-9) && t <= hi * (1 + 1e-9)) out.push(t);
  }
  return out;
}

function padded([lo, hi]: [number, number], fraction: number): [number, number] {
  if (lo === hi) return lo === 0 ? [-1, 1] : [lo - Math.abs(lo) * 0.5, hi + Math.abs(hi) * 0.5];
  const pad = (hi - lo) * fraction;
  return [lo - pad, hi + pad];
}

export function linearScale(range: [number, number], px: [number, number], pad = 0, tickCount = 7): Scale {
  const domain = padded(range, pad);
  const [d0, d1] = domain;
  return { domain, ticks: niceTicks(d0, d1, tickCount), log: false, toPx: (v) => px[0] + ((v - d0) / (d1 - d0)) * (px[1] - px[0]) };
}

export function logScale(range: [number, number], px: [number, number]): Scale {
  const [lo, hi] = range[0] === range[1] ? [range[0] / 2, range[1] * 2] : range;
  const l0 = Math.log10(lo);
  const l1 = Math.log10(hi);
  return { domain: [lo, hi], ticks: logTicks(lo, hi), log: true, toPx: (v) => px[0] + ((Math.log10(v) - l0) / (l1 - l0)) * (px[1] - px[0]) };
}

export function isAscending(xs: ReadonlyArray<number | null>): boolean {
  let prev = -Infinity;
  for (const v of xs) {
    if (v === null) continue;
    if (v < prev) return false;
    prev = v;
  }
  return true;
}
