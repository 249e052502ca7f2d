/**
 * Units in column headers: `time (µs)`, `time [us]`, `f / MHz`, `B (mT)`, `freq_MHz`.
 * The unit stays as written (normalised spelling, e.g. `us` → `µs`); data are never rescaled
 * here. `toSIFactor` gives the factor that converts a value in that unit to its SI unit.
 */

export interface SIFactor {
  /** s, Hz, T, m, V, A, counts, cps (= counts/s), 1 (for %), dBm. */
  siUnit: string;
  /** value_in_SI = value × factor. */
  factor: number;
}

interface BaseUnit {
  symbol: string;
  siUnit: string;
  factor: number;
  prefixable: boolean;
}

const MICRO = "\u00B5";
const GREEK_MU = "\u03BC";

const PREFIX: Record<string, number> = { p: 1e-12, n: 1e-9, [MICRO]: 1e-6, m: 1e-3, k: 1e3, M: 1e6, G: 1e9 };

function base(symbol: string, siUnit: string, factor: number, prefixable = true): BaseUnit {
  return { symbol, siUnit, factor, prefixable };
}

/** Spellings seen in instrument exports → canonical base unit. Lookup is exact except for `hz`. */
const BASE_UNITS = new Map<string, BaseUnit>([
  ["s", base("s", "s", 1)],
  ["sec", base("s", "s", 1)],
  ["secs", base("s", "s", 1)],
  ["Hz", base("Hz", "Hz", 1)],
  ["T", base("T", "T", 1)],
  // Gauss is still the everyday field unit in NV work; 1 G = 1e-4 T.
  ["G", base("G", "T", 1e-4)],
  ["m", base("m", "m", 1)],
  ["V", base("V", "V", 1)],
  ["A", base("A", "A", 1)],
  ["counts", base("counts", "counts", 1)],
  ["count", base("counts", "counts", 1)],
  ["cts", base("counts", "counts", 1)],
  ["cnts", base("counts", "counts", 1)],
  ["cps", base("cps", "cps", 1)],
  ["counts/s", base("cps", "cps", 1)],
  ["counts/sec", base("cps", "cps", 1)],
  ["cts/s", base("cps", "cps", 1)],
  ["c/s", base("cps", "cps", 1)],
  ["%", base("%", "1", 0.01, false)],
  ["dBm", base("dBm", "dBm", 1, false)],
]);

export interface ResolvedUnit extends SIFactor {
  /** Canonical spelling, e.g. `µs`, `kHz`, `kcps`. */
  symbol: string;
}

function lookupBase(s: string): BaseUnit | undefined {
  return BASE_UNITS.get(s) ?? (s.toLowerCase() === "hz" ? BASE_UNITS.get("Hz") : undefined);
}

/** Resolves a unit spelling to its canonical symbol and SI factor; null when not a known unit. */
export function resolveUnit(unit: string): ResolvedUnit | null {
  const s = unit.trim().replaceAll(GREEK_MU, MICRO);
  if (s === "") return null;
  const exact = lookupBase(s);
  if (exact) return { symbol: exact.symbol, siUnit: exact.siUnit, factor: exact.factor };
  if (s.length < 2) return null;
  let prefix = s[0];
  const rest = s.slice(1);
  const b = lookupBase(rest);
  if (!b || !b.prefixable) return null;
  // `u` is the ASCII stand-in for micro; `K` before Hz is a common slip for kilo.
  if (prefix === "u") prefix = MICRO;
  if (prefix === "K" && b.symbol === "Hz") prefix = "k";
  const p = PREFIX[prefix];
  if (p === undefined) return null;
  return { symbol: prefix + b.symbol, siUnit: b.siUnit, factor: p * b.factor };
}

/** SI unit and factor for a unit such as `µs`, `us`, `MHz`, `mT`, `kcps`, `%`; null when unknown. */
export function toSIFactor(unit: string): SIFactor | null {
  const r = resolveUnit(unit);
  return r ? { siUnit: r.siUnit, factor: r.factor } : null;
}

/** Unknown units are kept as written, only the micro sign is unified. */
function normaliseUnit(unit: string): string {
  return resolveUnit(unit)?.symbol ?? unit.trim().replaceAll(GREEK_MU, MICRO);
}

const PAREN = /^(.*?)\s*\(([^()]*)\)\s*$/;
const BRACKET = /^(.*?)\s*\[([^[\]]*)\]\s*$/;
const SPACED_SLASH = /^(.*\S)\s+\/\s+(\S.*)$/;
const TIGHT_SLASH = /^(.*[^\s/])\/([^\s/]+)$/;
const UNDERSCORE = /^(.*[^_])_([^_\s]{2,})$/;

/** The rule of `parseHeaderUnit` in one line, for the people who upload files (dataset page). */
export const HEADER_UNIT_RULE =
  "Units are split off column headers: a trailing (…) or […] or a spaced “ / …” is always the unit (“time (µs)” → column time, unit µs); " +
  "a tight “/unit” or “_unit” suffix only when it is a known unit (“t_us” → t, µs; “run_id” and “counts/s” stay whole). " +
  "Unit spellings are normalised (us → µs); values are never rescaled. In figure specs, use the column name, not the header.";

/**
 * Splits a header into quantity name and unit. A bare `/` or `_` suffix only counts as a unit
 * when it is a known unit (so `counts/s` and `run_id` stay whole).
 */
export function parseHeaderUnit(header: string): { name: string; unit: string | null } {
  const h = header.trim();
  for (const re of [PAREN, BRACKET, SPACED_SLASH]) {
    const m = re.exec(h);
    if (m && m[1].trim() !== "") {
      const u = m[2].trim();
      return { name: m[1].trim(), unit: u === "" ? null : normaliseUnit(u) };
    }
  }
  for (const re of [TIGHT_SLASH, UNDERSCORE]) {
    const m = re.exec(h);
    if (m && resolveUnit(m[2]) && !resolveUnit(h) && !resolveUnit(m[1])) {
      return { name: m[1].trim(), unit: normaliseUnit(m[2]) };
    }
  }
  return { name: h, unit: null };
}
