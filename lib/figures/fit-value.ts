/**
 * A fitted value written for a figure: "T₂ = 38.7 ± 0.7 µs". The standard uncertainty keeps one
 * significant digit, or two when its first digit is 1 or 2 (one digit would change it by up to
 * 50 %); the value is rounded to the same decimal place. BIPM JCGM 100:2008 (GUM) §7.2.6: state
 * the uncertainty with at most two significant digits, the estimate rounded to match.
 */

/** The value and its uncertainty rounded together, as decimal strings (uncertainty null when there is none). */
export function roundWithUncertainty(value: number, uncertainty: number | null | undefined): { value: string; uncertainty: string | null } {
  if (!Number.isFinite(value)) return { value: "—", uncertainty: null };
  if (uncertainty === null || uncertainty === undefined || !Number.isFinite(uncertainty) || uncertainty <= 0)
    return { value: String(Number(value.toPrecision(4))), uncertainty: null };
  let place = placeFor(uncertainty);
  // Rounding can carry into a new leading digit (0.096 → 0.10): decide the digits again from the rounded uncertainty.
  const rounded = roundAt(uncertainty, place);
  place = placeFor(rounded);
  return { value: fixedAt(value, place), uncertainty: fixedAt(uncertainty, place) };
}

/** The power of ten of the last digit kept for an uncertainty: two digits when it starts with 1 or 2, else one. */
function placeFor(u: number): number {
  const lead = Math.floor(Math.log10(u));
  const first = Math.floor(Number((u / 10 ** lead).toPrecision(12)));
  return first <= 2 ? lead - 1 : lead;
}

function roundAt(x: number, place: number): number {
  return place >= 0 ? Math.round(x / 10 ** place) * 10 ** place : Math.round(x * 10 ** -place) / 10 ** -place;
}

function fixedAt(x: number, place: number): string {
  const r = roundAt(x, place);
  const text = place >= 0 ? r.toFixed(0) : r.toFixed(-place);
  return text === "-0" || /^-0\.0*$/.test(text) ? text.slice(1) : text;
}

/** "38.7 ± 0.7", or the value alone when it has no uncertainty. */
export function formatWithUncertainty(value: number, uncertainty: number | null | undefined): string {
  const r = roundWithUncertainty(value, uncertainty);
  return r.uncertainty === null ? r.value : `${r.value} ± ${r.uncertainty}`;
}

const SUBSCRIPT: Record<string, string> = { "0": "₀", "1": "₁", "2": "₂", "3": "₃", "4": "₄", "5": "₅", "6": "₆", "7": "₇", "8": "₈", "9": "₉" };

/** A parameter's name as a symbol: trailing digits written as subscripts ("T2" → "T₂", "f0" → "f₀"). */
export function parameterSymbol(name: string): string {
  const m = /^([A-Za-zα-ωΑ-Ω]+)_?(\d+)$/.exec(name);
  return m ? m[1] + [...m[2]].map((d) => SUBSCRIPT[d]).join("") : name;
}

/** A stored run's fitted parameter, as its result keeps it. */
export interface StoredParameter {
  name: string;
  value: number | null;
  stderr: number | null;
  unit: string | null;
  fixed?: boolean;
}

/** The rows a binding to a run's parameters gives the spec: one per parameter, with the text to draw. */
export interface ParameterRow {
  [key: string]: string | number | null;
  name: string;
  symbol: string;
  value: number | null;
  error: number | null;
  unit: string;
  model: string;
  /** "T₂ = 38.7 ± 0.7 µs" */
  text: string;
}

/** The columns of those rows, for the checks that compare a spec's fields with the bound data. */
export const PARAMETER_COLUMNS = ["name", "symbol", "value", "error", "unit", "model", "text"] as const;

/**
 * One row per fitted parameter of a run (fixed parameters carry no uncertainty). A fitted parameter
 * the data do not determine (stored without a standard error) says so in its text instead of
 * passing for an exact number.
 */
export function parameterRows(model: string, parameters: StoredParameter[]): ParameterRow[] {
  return parameters.map((p) => {
    const error = p.fixed || p.stderr === null || !Number.isFinite(p.stderr) ? null : p.stderr;
    const unit = p.unit ?? "";
    const symbol = parameterSymbol(p.name);
    const undetermined = !p.fixed && error === null;
    const number = p.value === null || !Number.isFinite(p.value) ? "—" : formatWithUncertainty(p.value, error);
    const text = `${symbol} = ${number}${unit ? ` ${unit}` : ""}${undetermined ? " (not determined by the data)" : ""}`;
    return { name: p.name, symbol, value: p.value, error, unit, model, text };
  });
}

/** The parameters kept in a stored run's result (anything malformed left out). */
export function storedParameters(result: unknown): StoredParameter[] {
  const params = (result as { parameters?: unknown } | null)?.parameters;
  if (!Array.isArray(params)) return [];
  const num = (v: unknown) => (typeof v === "number" && Number.isFinite(v) ? v : null);
  return params.flatMap((p: unknown) => {
    const q = p as Record<string, unknown>;
    return typeof q?.name === "string"
      ? [{ name: q.name, value: num(q.value), stderr: num(q.stderr), unit: typeof q.unit === "string" ? q.unit : null, fixed: q.fixed === true }]
      : [];
  });
}

/** Parameters a figure usually states, most wanted first: coherence and relaxation times, then line positions. */
const HEADLINE = ["T2", "T2star", "T1", "f0", "x0", "tau", "tau0", "Psat", "fwhm"];

/** The parameter "Show fitted value" offers first: a headline one when the run has it, else the first with an uncertainty. */
export function headlineParameter(parameters: StoredParameter[]): string | null {
  const determined = (p: StoredParameter) => p.fixed || p.stderr !== null;
  const named = HEADLINE.find((h) => parameters.some((p) => p.name === h && determined(p)));
  return named ?? parameters.find((p) => p.stderr !== null && !p.fixed)?.name ?? parameters[0]?.name ?? null;
}
