/** Display helpers for fitted numbers: significant digits, value ± standard error, axis titles. */

const SUPERSCRIPT: Record<string, string> = { "-": "⁻", "0": "⁰", "1": "¹", "2": "²", "3": "³", "4": "⁴", "5": "⁵", "6": "⁶", "7": "⁷", "8": "⁸", "9": "⁹" };
const superscript = (n: number) => String(n).split("").map((c) => SUPERSCRIPT[c] ?? c).join("");

/** Up to `digits` significant digits; ×10ⁿ form outside 1e-3 … 1e5 so tables stay short. */
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

export function axisTitle(name: string, unit: string | null | undefined): string {
  return unit ? `${name} (${unit})` : name;
}

export function formatWhen(d: Date | string): string {
  return new Date(d).toISOString().replace("T", " ").slice(0, 16) + " UTC";
}
