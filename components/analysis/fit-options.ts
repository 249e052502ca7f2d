/** Turning the fit form (strings the user typed) into the API's options, and the form's defaults. */
import type { FitOptions, FitParameter, ModelInfo } from "./api";

/**
 * One parameter as typed: `value` is the start value, or with `fixed` on the value the parameter is
 * held at; `lower`/`upper` are the two ends of its allowed range (blank = the model's default).
 */
export interface ParamDraft {
  value: string;
  fixed: boolean;
  lower: string;
  upper: string;
}
export const EMPTY_DRAFT: ParamDraft = { value: "", fixed: false, lower: "", upper: "" };

/** The model's default bounds per parameter, as the last fit reported them (null = unlimited). */
export type DefaultBounds = Record<string, Array<number | null>>;

export interface Column {
  name: string;
  unit: string | null;
  type: "number" | "string";
}

/** Models made for this kind of measurement first (those naming it first at the very top), then the rest. */
export function orderModels(models: readonly ModelInfo[], kind: string): { suggested: ModelInfo[]; others: ModelInfo[] } {
  const suggested = models.filter((m) => m.kinds.includes(kind)).sort((a, b) => Number(b.kinds[0] === kind) - Number(a.kinds[0] === kind));
  return { suggested, others: models.filter((m) => !m.kinds.includes(kind)) };
}

const SIGMA_NAME = /^(σ|sigma|err|error|stderr|sd|uncertainty|dy|y_?err)\b/i;

/** First numeric column as x, the next (not an uncertainty) as y, one named sigma/σ/err… as σ. */
export function defaultColumns(columns: readonly Column[]): { x: string; y: string; sigma: string } {
  const numeric = columns.filter((c) => c.type === "number").map((c) => c.name);
  const sigma = numeric.find((n) => SIGMA_NAME.test(n)) ?? "";
  const x = numeric[0] ?? "";
  const y = numeric.find((n, i) => i > 0 && n !== sigma) ?? numeric[1] ?? "";
  return { x, y, sigma };
}

function parseNumber(text: string, what: string): number | undefined {
  const t = text.trim().replace(/−/g, "-");
  if (!t) return undefined;
  const v = Number(t);
  if (!Number.isFinite(v)) throw new Error(`${what}: “${text}” is not a number.`);
  return v;
}

export type BuildResult = { options: FitOptions } | { error: string } | { needDefaults: true };

/**
 * Options for POST /api/analyses[/preview]: `start`, `fixed` and `bounds`. A blank start means
 * automatic; a blank end of the range means the model's default, which needs the defaults of a
 * previous fit when only one end is typed.
 */
export function buildOptions(
  params: ModelInfo["parameters"],
  drafts: Record<string, ParamDraft>,
  columns: { x: string; y: string; sigma: string },
  defaults?: DefaultBounds,
): BuildResult {
  if (!columns.x) return { error: "x: choose the x column." };
  if (!columns.y) return { error: "y: choose the y column." };
  const start: Record<string, number> = {},
    fixed: Record<string, number> = {},
    bounds: Record<string, [number, number]> = {};
  try {
    for (const p of params) {
      const d = drafts[p.name] ?? EMPTY_DRAFT;
      if (d.fixed) {
        const v = parseNumber(d.value, `${p.name} held value`);
        if (v === undefined) throw new Error(`${p.name}: give the value to hold it at.`);
        fixed[p.name] = v;
        continue;
      }
      const s = parseNumber(d.value, `${p.name} start value`);
      if (s !== undefined) start[p.name] = s;
      const lo = parseNumber(d.lower, `${p.name} range from`);
      const hi = parseNumber(d.upper, `${p.name} range to`);
      if (lo === undefined && hi === undefined) continue;
      if (lo === undefined || hi === undefined) {
        const known = defaults?.[p.name];
        if (!known) return { needDefaults: true };
        const other = lo === undefined ? known[0] : known[1];
        if (other === null || other === undefined) {
          throw new Error(`${p.name}: by default its range is open ${lo === undefined ? "below" : "above"}; give both ends of the range.`);
        }
        bounds[p.name] = lo === undefined ? [other, hi!] : [lo, other];
      } else {
        bounds[p.name] = [lo, hi];
      }
      if (!(bounds[p.name][0] < bounds[p.name][1])) throw new Error(`${p.name}: the range must run from a smaller to a larger number.`);
    }
  } catch (err) {
    return { error: (err as Error).message };
  }
  const options: FitOptions = { x: columns.x, y: columns.y };
  if (columns.sigma) options.sigma = columns.sigma;
  if (Object.keys(start).length) options.start = start;
  if (Object.keys(fixed).length) options.fixed = fixed;
  if (Object.keys(bounds).length) options.bounds = bounds;
  return { options };
}

export function defaultsFrom(parameters: readonly FitParameter[]): DefaultBounds {
  return Object.fromEntries(parameters.map((p) => [p.name, p.bounds]));
}
