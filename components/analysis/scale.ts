/** Axis scales and ticks for the hand-drawn SVG plots (data units in, pixels out). */
import { formatNumber } from "./format";

export interface Scale {
  (v: number): number;
  ticks: Array<{ value: number; label: string }>;
}

function niceStep(span: number, count: number): number {
  const raw = span / Math.max(1, count);
  const p = 10 ** Math.floor(Math.log10(raw));
  const f = raw / p;
  return (f < 1.5 ? 1 : f < 3 ? 2 : f < 7 ? 5 : 10) * p;
}

/** The finite extent of the given series, padded by `pad` of the span (a flat series gets ±1 around its value). */
export function extent(series: Array<ArrayLike<number | null>>, pad = 0.05, positiveOnly = false): [number, number] {
  let lo = Infinity, hi = -Infinity;
  for (const s of series) {
    for (let i = 0; i < s.length; i++) {
      const v = s[i];
      if (v === null || v === undefined || !Number.isFinite(v) || (positiveOnly && v <= 0)) continue;
      if (v < lo) lo = v;
      if (v > hi) hi = v;
    }
  }
  if (!Number.isFinite(lo)) return positiveOnly ? [1, 10] : [0, 1];
  if (lo === hi) return positiveOnly ? [lo / 2, hi * 2] : [lo - (Math.abs(lo) || 1), hi + (Math.abs(hi) || 1)];
  if (positiveOnly) {
    const f = (hi / lo) ** pad;
    return [lo / f, hi * f];
  }
  const d = (hi - lo) * pad;
  return [lo - d, hi + d];
}

export function linearScale(domain: [number, number], range: [number, number], tickCount = 5): Scale {
  const [d0, d1] = domain;
  const [r0, r1] = range;
  const f = ((v: number) => r0 + ((v - d0) / (d1 - d0)) * (r1 - r0)) as Scale;
  const step = niceStep(d1 - d0, tickCount);
  const ticks: Scale["ticks"] = [];
  for (let v = Math.ceil(d0 / step) * step; v <= d1 + step * 1e-9; v += step) {
    const value = Math.abs(v) < step * 1e-9 ? 0 : v;
    ticks.push({ value, label: formatNumber(value, 6) });
  }
  f.ticks = ticks;
  return f;
}

export function logScale(domain: [number, number], range: [number, number]): Scale {
  const [l0, l1] = [Math.log10(domain[0]), Math.log10(domain[1])];
  const [r0, r1] = range;
  const f = ((v: number) => r0 + ((Math.log10(v) - l0) / (l1 - l0)) * (r1 - r0)) as Scale;
  const decades = l1 - l0;
  const mantissas = decades <= 1.5 ? [1, 2, 5] : decades <= 3 ? [1, 3] : [1];
  const ticks: Scale["ticks"] = [];
  for (let e = Math.floor(l0); e <= Math.ceil(l1); e++) {
    for (const m of mantissas) {
      const value = m * 10 ** e;
      if (value >= domain[0] && value <= domain[1]) ticks.push({ value, label: formatNumber(value, 3) });
    }
  }
  f.ticks = ticks;
  return f;
}
