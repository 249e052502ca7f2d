/**
 * The budget for settings that would hang a browser: count-like values (ticks, bins, samples,
 * impute keys, view sizes, number of views) refused past "common practice" caps.
 */
import type { SpecPath } from "./spec-path";
import type { SecurityIssue } from "./spec-security";

export type Json = null | boolean | number | string | Json[] | { [key: string]: Json };
export const isObject = (v: unknown): v is Record<string, Json> => typeof v === "object" && v !== null && !Array.isArray(v);

interface Issues {
  issues: SecurityIssue[];
}

// Budget caps ("common practice" limits: far above what a publication panel uses, far below what
// makes Vega allocate or loop for minutes in a reviewer's browser).
/** Axis and legend ticks (Vega-Lite's own default is about one per 40 px). */
const MAX_TICK_COUNT = 1_000;
/** Bins from `maxbins` (bin and timeUnit params), from `step` over a given `extent`, and scale `bins`. */
const MAX_BINS = 1_000;
/** Samples of density (`steps`, `minsteps`, `maxsteps`; Vega's default is 25–200) and quantile (1 / `step`). */
const MAX_SAMPLE_STEPS = 1_000;
/** Polynomial regression order: the fit solves an order × order system; past ~20 it is numerically meaningless. */
const MAX_REGRESSION_ORDER = 20;
/** Key values an impute `keyvals: {start, stop, step}` sequence generates (like inline rows). */
const MAX_IMPUTE_KEYS = 5_000;
/** View width/height, view `step` and config.view sizes, points (10,000 pt ≈ 3.5 m); default ticks grow with the size. */
const MAX_VIEW_SIZE = 10_000;
/** Views from layers, concatenation and repeat (each is compiled and laid out separately). */
export const MAX_VIEWS = 200;

export const fmt = (n: number) => n.toLocaleString("en", { maximumFractionDigits: 6 });
/** How many values start..stop by step gives (a hair of tolerance for decimal steps such as 0.1). */
const countOf = (start: number, stop: number, step: number) => Math.max(0, Math.ceil((stop - start) / step - 1e-9));
const isNum = (v: unknown): v is number => typeof v === "number" && Number.isFinite(v);

const SIZE_KEYS = new Set(["width", "height", "continuousWidth", "continuousHeight", "discreteWidth", "discreteHeight"]);
const STEP_KEYS = new Set(["steps", "minsteps", "maxsteps"]);

/**
 * Count-like settings under `key` (at `[...path, key]`). Returns false when the value was refused
 * and must not be walked further.
 */
export function budget(key: string, value: Json, path: SpecPath, ctx: Issues): boolean {
  const at = [...path, key];
  const over = (where: SpecPath, label: string, v: number, cap: number, suffix = "") =>
    ctx.issues.push({ path: where, message: `${label} is ${fmt(v)}; the limit is ${fmt(cap)}${suffix}` });
  if (key === "tickCount") {
    if (isObject(value) && ("expr" in value || "signal" in value)) {
      ctx.issues.push({ path: at, message: `tickCount must be a number or a time interval here, not an expression (at most ${fmt(MAX_TICK_COUNT)} ticks)` });
      return false;
    }
    if (isNum(value) && value > MAX_TICK_COUNT) over(at, key, value, MAX_TICK_COUNT);
  } else if (key === "maxbins") {
    if (isNum(value) && value > MAX_BINS) over(at, key, value, MAX_BINS);
  } else if (STEP_KEYS.has(key)) {
    if (isNum(value) && value > MAX_SAMPLE_STEPS) over(at, key, value, MAX_SAMPLE_STEPS);
  } else if ((key === "bin" || key === "bins") && isObject(value) && value.step !== undefined) {
    const { step } = value;
    const [start, stop] = key === "bin" ? (Array.isArray(value.extent) ? value.extent : []) : [value.start, value.stop];
    if (!isNum(step) || step <= 0) ctx.issues.push({ path: [...at, "step"], message: `${key} step must be a positive number` });
    else if (isNum(start) && isNum(stop) && countOf(Math.min(start, stop), Math.max(start, stop), step) > MAX_BINS) {
      const n = countOf(Math.min(start, stop), Math.max(start, stop), step);
      ctx.issues.push({
        path: [...at, "step"],
        message: `${key} step ${fmt(step)} from ${fmt(start)} to ${fmt(stop)} makes ${fmt(n)} bins; the limit is ${fmt(MAX_BINS)}`,
      });
    }
  } else if (key === "keyvals" && isObject(value)) {
    const { start = 0, stop } = value;
    const step = value.step ?? (isNum(stop) && isNum(start) && stop < start ? -1 : 1);
    if (!isNum(start) || !isNum(stop) || !isNum(step) || step === 0) {
      ctx.issues.push({ path: at, message: "an impute key sequence needs a numeric stop and a non-zero step" });
      return false;
    }
    const n = countOf(start, stop, step);
    if (n > MAX_IMPUTE_KEYS) ctx.issues.push({ path: at, message: `the impute key sequence makes ${fmt(n)} key values; the limit is ${fmt(MAX_IMPUTE_KEYS)}` });
  } else if (SIZE_KEYS.has(key)) {
    if (isNum(value) && value > MAX_VIEW_SIZE) over(at, key, value, MAX_VIEW_SIZE, " (points)");
    else if (isObject(value) && isNum(value.step) && value.step > MAX_VIEW_SIZE) over([...at, "step"], `${key} step`, value.step, MAX_VIEW_SIZE, " (points)");
  } else if (key === "step" && path[path.length - 1] === "view") {
    if (isNum(value) && value > MAX_VIEW_SIZE) over(at, "view step", value, MAX_VIEW_SIZE, " (points)");
  }
  return true;
}

/** Settings whose meaning depends on the transform they sit in. */
export function transformBudget(node: Record<string, Json>, path: SpecPath, ctx: Issues): void {
  if ("quantile" in node && node.step !== undefined) {
    const { step } = node;
    if (!isNum(step) || step <= 0 || step >= 1)
      ctx.issues.push({ path: [...path, "step"], message: "the quantile step must be a probability between 0 and 1" });
    else if (Math.ceil(1 / step - 1e-9) > MAX_SAMPLE_STEPS) {
      ctx.issues.push({
        path: [...path, "step"],
        message: `a quantile step of ${fmt(step)} asks for ${fmt(Math.ceil(1 / step - 1e-9))} quantiles; the limit is ${fmt(MAX_SAMPLE_STEPS)}`,
      });
    }
  }
  if ("regression" in node && isNum(node.order) && node.order > MAX_REGRESSION_ORDER) {
    ctx.issues.push({ path: [...path, "order"], message: `the regression order is ${fmt(node.order)}; the limit is ${fmt(MAX_REGRESSION_ORDER)}` });
  }
}

/** Views the spec compiles to: units and layers, summed over concatenation, multiplied by repeat. */
export function countViews(node: Json): number {
  if (!isObject(node)) return 0;
  let n = "mark" in node ? 1 : 0;
  if (Array.isArray(node.layer)) for (const l of node.layer) n += countViews(l);
  for (const k of ["concat", "hconcat", "vconcat"]) {
    const items = node[k];
    if (Array.isArray(items)) for (const c of items) n += countViews(c);
  }
  if (isObject(node.spec)) n += countViews(node.spec) * repeatCount(node.repeat);
  return n;
}

function repeatCount(repeat: Json | undefined): number {
  if (Array.isArray(repeat)) return Math.max(1, repeat.length);
  if (!isObject(repeat)) return 1;
  const len = (v: Json | undefined) => (Array.isArray(v) ? Math.max(1, v.length) : 1);
  return len(repeat.row) * len(repeat.column) * len(repeat.layer);
}
