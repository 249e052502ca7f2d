/**
 * Axis arithmetic for the hand-drawn SVG plots (the quick plot, the fit plot, the strip plot):
 * data range → padded domain → ticks with labels → pixels.
 */
import { formatNumber } from "@/lib/data/format";

interface Tick {
  value: number;
  label: string;
}

/** Data units in, pixels out; `domain` is what the axis spans, `ticks` lie inside it. */
export interface Scale {
  (v: number): number;
  domain: [number, number];
  ticks: Tick[];
  log: boolean;
}

/** The finite range of the given series (positive values only for a log axis); null when there is none. */
export function extent(series: ReadonlyArray<ArrayLike<number | null>>, positiveOnly = false): [number, number] | null {
  let lo = Infinity;
  let hi = -Infinity;
  for (const s of series) {
    for (let i = 0; i < s.length; i++) {
      const v = s[i];
      if (v === null || v === undefined || !Number.isFinite(v) || (positiveOnly && v <= 0)) continue;
      if (v < lo) lo = v;
      if (v > hi) hi = v;
    }
  }
  return lo <= hi ? [lo, hi] : null;
}

/**
 * The range widened by `fraction` of its span on each side (on a log axis, of its decades). A flat
 * range gets ±50 % around its value (±1 around zero; ×½ … ×2 on a log axis); no range at all
 * becomes 0 … 1 (1 … 10 on a log axis).
 */
export function padRange(range: [number, number] | null, fraction: number, log = false): [number, number] {
  if (!range) return log ? [1, 10] : [0, 1];
  const [lo, hi] = range;
  if (log) {
    if (lo === hi) return [lo / 2, hi * 2];
    const f = (hi / lo) ** fraction;
    return [lo / f, hi * f];
  }
  if (lo === hi) return lo === 0 ? [-1, 1] : [lo - Math.abs(lo) * 0.5, hi + Math.abs(hi) * 0.5];
  const pad = (hi - lo) * fraction;
  return [lo - pad, hi + pad];
}

/** Round steps of 1, 2 or 5 × 10ⁿ, the one nearest to `count` of them across the range. */
function niceTicks(lo: number, hi: number, count = 5): number[] {
  const raw = (hi - lo) / Math.max(1, count);
  const mag = 10 ** Math.floor(Math.log10(raw));
  const f = raw / mag;
  const step = (f < 1.5 ? 1 : f < 3 ? 2 : f < 7 ? 5 : 10) * mag;
  const out: number[] = [];
  for (let k = Math.ceil(lo / step - 1e-9); k * step <= hi + step * 1e-9; k++) {
    const t = k * step;
    out.push(Math.abs(t) < step * 1e-9 ? 0 : Number(t.toPrecision(12)));
  }
  return out;
}

/** Decades, with 2 and 5 in between over at most 1.5 decades, 3 over at most 3. */
function logTicks(lo: number, hi: number): number[] {
  const l0 = Math.log10(lo);
  const l1 = Math.log10(hi);
  const decades = l1 - l0;
  const mantissas = decades <= 1.5 ? [1, 2, 5] : decades <= 3 ? [1, 3] : [1];
  const out: number[] = [];
  for (let e = Math.floor(l0); e <= Math.ceil(l1); e++) {
    for (const m of mantissas) {
      const t = Number((m * 10 ** e).toPrecision(12));
      if (t >= lo * (1 - 1e-9) && t <= hi * (1 + 1e-9)) out.push(t);
    }
  }
  return out;
}

function scale(domain: [number, number], log: boolean, toPx: (v: number) => number, ticks: number[]): Scale {
  const f = toPx as Scale;
  f.domain = domain;
  f.log = log;
  f.ticks = ticks.map((value) => ({ value, label: formatNumber(value, 6) }));
  return f;
}

export function linearScale(domain: [number, number], px: [number, number], tickCount = 5): Scale {
  const [d0, d1] = domain;
  return scale(domain, false, (v) => px[0] + ((v - d0) / (d1 - d0)) * (px[1] - px[0]), niceTicks(d0, d1, tickCount));
}

export function logScale(domain: [number, number], px: [number, number]): Scale {
  const l0 = Math.log10(domain[0]);
  const l1 = Math.log10(domain[1]);
  return scale(domain, true, (v) => px[0] + ((Math.log10(v) - l0) / (l1 - l0)) * (px[1] - px[0]), logTicks(domain[0], domain[1]));
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
