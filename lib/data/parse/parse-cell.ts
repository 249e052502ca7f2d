/**
 * Reading one cell as a number, the careful way. The scanner's fast path handles plain decimals
 * itself and falls back to this for everything else (quoted cells, long mantissas, NaN, inf …).
 */

/** Cells that mean "no value here" in the exports we see; they become NaN (missing). */
const MISSING_TOKENS = new Set(["", "nan", "-nan", "+nan", "na", "n/a", "#n/a", "null", "none", "-", "--", "---", "?"]);
const POS_INF = new Set(["inf", "+inf", "infinity", "+infinity"]);
const NEG_INF = new Set(["-inf", "-infinity"]);

// Number() alone would accept "0x1A", "1_0"-free hex, "" and whitespace; this pattern is what we call a number.
const PLAIN_NUMBER = /^[+-]?(?:\d+\.?\d*|\.\d+)(?:[eEdD][+-]?\d+)?$/;

/** Exact powers of ten: m·10^k and m/10^k are correctly rounded for m ≤ 2^53, |k| ≤ 22 (Clinger). */
export const POW10 = [1, 1e1, 1e2, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9, 1e10, 1e11, 1e12, 1e13, 1e14, 1e15, 1e16, 1e17, 1e18, 1e19, 1e20, 1e21, 1e22];

/**
 * A number, NaN for a missing cell, or undefined when the cell is text.
 * With a decimal comma, a "." makes the cell text (it is most likely a thousands separator).
 */
export function parseCell(raw: string, decimalComma: boolean): number | undefined {
  let s = raw.trim();
  if (s.length <= 9) {
    const lower = s.toLowerCase();
    if (MISSING_TOKENS.has(lower)) return NaN;
    if (POS_INF.has(lower)) return Infinity;
    if (NEG_INF.has(lower)) return -Infinity;
  }
  if (decimalComma) {
    if (s.includes(".")) return undefined;
    s = s.replace(",", ".");
  }
  if (!PLAIN_NUMBER.test(s)) return undefined;
  // Fortran writes 1.0D+03.
  const c = s.search(/[dD]/);
  if (c >= 0) s = `${s.slice(0, c)}e${s.slice(c + 1)}`;
  return Number(s);
}

/** True when the cell holds a real number (not text, not a missing marker). */
export function isNumericCell(raw: string, decimalComma: boolean): boolean {
  const v = parseCell(raw, decimalComma);
  return v !== undefined && !Number.isNaN(v);
}

/** True when the cell is empty or a missing-value marker such as NaN or N/A. */
export function isMissingCell(raw: string): boolean {
  const s = raw.trim();
  return s.length <= 9 && MISSING_TOKENS.has(s.toLowerCase());
}
