/** The axis rule: every axis titled, with a unit or marked dimensionless. */
import { collectViews, isObj, type Obj } from "./spec-views";
import { quote, type PrintCheckItem } from "./types";

/** Last words of an axis title that name a dimensionless quantity (no unit asked). */
const DIMENSIONLESS_WORDS = new Set([
  "coherence",
  "contrast",
  "residual",
  "residuals",
  "ratio",
  "fraction",
  "visibility",
  "fidelity",
  "probability",
  "population",
  "polarization",
  "polarisation",
  "efficiency",
  "asymmetry",
  "correlation",
  "count",
  "counts",
  "number",
  "index",
  "factor",
]);

export interface AxisInfo {
  channel: "x" | "y";
  /** The title as drawn; null when the spec gives none (or null). */
  title: string | null;
  type: string;
}

export const titleText = (t: unknown): string | null | undefined =>
  t === null ? null : typeof t === "string" ? t : Array.isArray(t) ? t.filter((x) => typeof x === "string").join(" ") : undefined;

/** The x and y axes a spec draws, with their titles and types (axes drawn without labels left out). */
export function specAxes(spec: unknown): AxisInfo[] {
  const out: AxisInfo[] = [];
  for (const view of collectViews(spec)) {
    for (const channel of ["x", "y"] as const) {
      const defs = view.units.map((u) => u.encoding[channel]).filter((d): d is Obj => isObj(d) && ("field" in d || "aggregate" in d || "datum" in d));
      if (!defs.length) continue;
      const axes = defs.map((d) => d.axis);
      if (axes.every((a) => a === null)) continue;
      if (axes.some((a) => isObj(a) && a.labels === false) && !axes.some((a) => isObj(a) && typeof titleText(a.title) === "string")) continue;
      let title: string | null | undefined;
      for (const d of defs) {
        const t = titleText(d.title) ?? (isObj(d.axis) ? titleText(d.axis.title) : undefined);
        if (typeof t === "string") {
          title = t;
          break;
        }
        if (t === null && title === undefined) title = null;
      }
      const typed = defs.find((d) => typeof d.type === "string" && "field" in d) ?? defs.find((d) => typeof d.type === "string");
      const type = typed ? String(typed.type) : defs.some((d) => "aggregate" in d) ? "quantitative" : "nominal";
      out.push({ channel, title: title ?? null, type });
    }
  }
  return out;
}

/** Why an axis title fails the rule, or null when it passes. */
export function axisTitleProblem(axis: AxisInfo): string | null {
  const t = axis.title?.trim() ?? "";
  if (!t) return `the ${axis.channel} axis has no title`;
  if (axis.type !== "quantitative") return null;
  if (/\s\(([^()]*\S[^()]*)\)$/.test(t)) return null;
  const last = t.toLowerCase().split(/\s+/).at(-1) ?? "";
  if (DIMENSIONLESS_WORDS.has(last)) return null;
  return `the ${axis.channel} axis ${quote(t)} has no unit in parentheses — write “${t} (unit)”, or “(norm.)” / “(a.u.)” for a dimensionless one`;
}

export function checkAxes(panels: Array<{ letter: string; spec: unknown }>): PrintCheckItem {
  const problems: string[] = [];
  let axes = 0;
  for (const p of panels) {
    for (const a of specAxes(p.spec)) {
      axes++;
      const why = axisTitleProblem(a);
      if (why) problems.push(`panel ${p.letter}: ${why}`);
    }
  }
  return {
    id: "axis-units",
    label: "Every axis titled, with a unit in parentheses or dimensionless",
    ok: problems.length === 0,
    problems,
    detail: `${axes} axes`,
  };
}
