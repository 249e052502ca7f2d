/**
 * The one set of display formatters, for the browser and the server: numbers (significant digits,
 * value ± standard error, p-values), counts and sizes, axis titles with units, content hashes,
 * dates and relative times.
 */

const SUPERSCRIPT: Record<string, string> = { "-": "⁻", "0": "⁰", "1": "¹", "2": "²", "3": "³", "4": "⁴", "5": "⁵", "6": "⁶", "7": "⁷", "8": "⁸", "9": "⁹" };
const superscript = (n: number) =>
  String(n)
    .split("")
    .map((c) => SUPERSCRIPT[c] ?? c)
    .join("");

/** Up to `digits` significant digits; ×10ⁿ form outside 1e-3 … 1e5 so tables and ticks stay short. */
export function formatNumber(v: number | null | undefined, digits = 4): string {
  if (v === null || v === undefined || !Number.isFinite(v)) return "—";
  if (v === 0) return "0";
  const a = Math.abs(v);
  if (a >= 1e5 || a < 1e-3) {
    const e = Math.floor(Math.log10(a));
    const m = Number((v / 10 ** e).toPrecision(digits));
    return `${m}×10${superscript(e)}`;
  }
  return String(Number(v.toPrecision(digits)));
}

/** Decimal places that keep two significant digits of `err` (in the same scale as the value). */
function decimalsFor(err: number): number {
  const rounded = Number(err.toPrecision(2));
  return Math.min(12, Math.max(0, 1 - Math.floor(Math.log10(rounded))));
}

/**
 * value ± stderr, the value rounded to the standard error's second significant digit
 * (58.234 ± 3.4567 → "58.2 ± 3.5"); a shared power of ten for very large or small values.
 */
export function formatValueError(value: number | null | undefined, stderr: number | null | undefined): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return "—";
  if (stderr === null || stderr === undefined || !Number.isFinite(stderr) || stderr <= 0) return formatNumber(value);
  const magnitude = Math.floor(Math.log10(Math.max(Math.abs(value), stderr)));
  if (magnitude >= 5 || magnitude <= -4) {
    const scale = 10 ** magnitude;
    const d = decimalsFor(stderr / scale);
    return `(${(value / scale).toFixed(d)} ± ${(stderr / scale).toFixed(d)})×10${superscript(magnitude)}`;
  }
  const d = decimalsFor(stderr);
  return `${value.toFixed(d)} ± ${stderr.toFixed(d)}`;
}

export function formatP(p: number | null | undefined): string {
  if (p === null || p === undefined || !Number.isFinite(p)) return "—";
  if (p < 1e-4) return "< 0.0001";
  return p.toPrecision(2);
}

/** 1,234,567 — row and column counts read better grouped. */
export function formatCount(n: number): string {
  return n.toLocaleString("en-US");
}

export function formatBytes(n: number): string {
  if (n < 1024) return `${n} B`;
  const units = ["kB", "MB", "GB"];
  let v = n / 1024;
  let i = 0;
  while (v >= 1024 && i < units.length - 1) {
    v /= 1024;
    i++;
  }
  return `${v < 10 ? v.toFixed(1) : Math.round(v)} ${units[i]}`;
}

/** "τ (µs)"; a name with no unit stays bare. */
export function axisTitle(name: string, unit?: string | null): string {
  return unit ? `${name} (${unit})` : name;
}

/** The first `length` characters of a content hash and "…", enough to tell versions apart on screen. */
export function shortHash(hash: string | null | undefined, length = 10): string {
  return hash ? `${hash.slice(0, length)}…` : "—";
}

/** "2025-03-14 09:26 UTC": minutes, in UTC, the same for every reader. */
export function formatDate(d: Date | string | number | null | undefined): string {
  if (d === null || d === undefined) return "—";
  return new Date(d).toISOString().replace("T", " ").slice(0, 16) + " UTC";
}

const UNITS: Array<[Intl.RelativeTimeFormatUnit, number]> = [
  ["year", 365 * 86_400_000],
  ["month", 30 * 86_400_000],
  ["week", 7 * 86_400_000],
  ["day", 86_400_000],
  ["hour", 3_600_000],
  ["minute", 60_000],
];
const rtf = new Intl.RelativeTimeFormat("en", { numeric: "auto" });

/** "3 hours ago" against `now` (ms); under a minute is "just now". */
export function relativeTime(at: Date | string | number, now = Date.now()): string {
  const diff = new Date(at).getTime() - now;
  for (const [unit, ms] of UNITS) {
    if (Math.abs(diff) >= ms) return rtf.format(Math.round(diff / ms), unit);
  }
  return "just now";
}
