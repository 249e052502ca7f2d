/** The rules on summarised data: error bars say what they show, and grouped data states n. */
import { titleText } from "./axes";
import { collectViews, isObj, markType, type Obj } from "./spec-views";
import type { PrintCheckItem } from "./types";

/** Words that say what an error bar is. */
const ERROR_DEFINITION =
  /(?<!\w)(standard deviations?|standard errors?|s\.\s?d\.?|sd|s\.\s?e\.(?:\s?m\.?)?|sem|std|stdev|confidence intervals?|ci|interquartile|iqr|percentiles?|min(?:imum)?\s*[–-]\s*max(?:imum)?)(?!\w)/i;
/** "n = 12", "N = 4". */
const N_STATED = /\bn\s*[=≥≤]\s*\d+/i;

export function definesErrorBars(text: string): boolean {
  return ERROR_DEFINITION.test(text);
}

const ERROR_CHANNELS = ["xError", "yError", "xError2", "yError2"];

/** Error bars a spec draws, with the columns they read (for errorbars drawn from precomputed columns). */
function specErrorBars(spec: unknown): { present: boolean; columns: string[] } {
  const columns = new Set<string>();
  let present = false;
  for (const view of collectViews(spec)) {
    for (const u of view.units) {
      const kind = markType(u.mark);
      const channels = ERROR_CHANNELS.filter((c) => isObj(u.encoding[c]));
      if (kind !== "errorbar" && kind !== "errorband" && !channels.length) continue;
      present = true;
      for (const c of channels) {
        const f = (u.encoding[c] as Obj).field;
        if (typeof f === "string") columns.add(f);
      }
      if (!channels.length)
        for (const c of ["x2", "y2"]) {
          const def = u.encoding[c];
          const f = isObj(def) ? def.field : null;
          if (typeof f === "string") columns.add(f);
        }
    }
  }
  return { present, columns: [...columns] };
}

/** Aggregates that summarise a group of values (not extents such as min/max, nor the count itself). */
const SUMMARY_OPS = new Set(["mean", "average", "median", "stdev", "stdevp", "stderr", "variance", "variancep", "sum", "q1", "q3", "ci0", "ci1"]);

/**
 * A spec that summarises groups: a summary aggregate (mean, median, sd …) in an encoding or in an aggregate
 * transform with a groupby, or an errorbar/errorband/boxplot over groups (not one drawn from error columns).
 */
export function specGroupsData(spec: unknown): boolean {
  for (const view of collectViews(spec)) {
    for (const u of view.units) {
      const kind = markType(u.mark);
      if (kind === "text") continue;
      if (kind === "boxplot") return true;
      if ((kind === "errorbar" || kind === "errorband") && !ERROR_CHANNELS.some((c) => isObj(u.encoding[c])) && !isObj(u.encoding.x2) && !isObj(u.encoding.y2))
        return true;
      if (Object.values(u.encoding).some((d) => isObj(d) && typeof d.aggregate === "string" && SUMMARY_OPS.has(d.aggregate))) return true;
      const summarises = (t: unknown) =>
        isObj(t) &&
        Array.isArray(t.aggregate) &&
        Array.isArray(t.groupby) &&
        t.groupby.length > 0 &&
        t.aggregate.some((a) => isObj(a) && typeof a.op === "string" && SUMMARY_OPS.has(a.op));
      if (u.transform.some(summarises)) return true;
    }
  }
  return false;
}

export interface PanelWords {
  letter: string;
  spec: unknown;
  /** The panel title, the current revision's message. */
  words: string[];
  /** Header lines of the bound files (`# key: value`), by column-like key. */
  headers: Array<Record<string, string>>;
  /** Texts drawn in the panel (from the composed SVG). */
  drawn: string[];
}

function panelText(p: PanelWords): string {
  const s = isObj(p.spec) ? p.spec : {};
  const title = titleText(isObj(s.title) ? s.title.text : s.title);
  return [typeof s.description === "string" ? s.description : "", title ?? "", ...p.words].join("\n");
}

export function checkErrorBars(panels: PanelWords[]): PrintCheckItem {
  const problems: string[] = [];
  let drawn = 0;
  for (const p of panels) {
    const bars = specErrorBars(p.spec);
    if (!bars.present) continue;
    drawn++;
    if (definesErrorBars(panelText(p))) continue;
    const fromHeader = bars.columns.some((col) =>
      p.headers.some((h) => Object.entries(h).some(([k, v]) => k.trim().toLowerCase() === col.toLowerCase() && definesErrorBars(v))),
    );
    if (fromHeader) continue;
    problems.push(
      `panel ${p.letter} draws error bars but does not say what they are (standard deviation, standard error, confidence interval…): say it in the panel's description or the revision message`,
    );
  }
  return {
    id: "error-bars",
    label: "Error bars say what they show",
    ok: problems.length === 0,
    problems,
    detail: drawn ? `${drawn} panel${drawn === 1 ? "" : "s"} with error bars` : "no error bars",
  };
}

export function checkGroupN(panels: PanelWords[]): PrintCheckItem {
  const problems: string[] = [];
  let grouped = 0;
  for (const p of panels) {
    if (!specGroupsData(p.spec)) continue;
    grouped++;
    if (p.drawn.some((t) => N_STATED.test(t)) || N_STATED.test(panelText(p))) continue;
    problems.push(`panel ${p.letter} summarises groups but does not state n: draw “n = …” per group or write it in the panel's description`);
  }
  return {
    id: "group-n",
    label: "n stated for grouped data",
    ok: problems.length === 0,
    problems,
    detail: grouped ? `${grouped} panel${grouped === 1 ? "" : "s"} with grouped data` : "no grouped data",
  };
}
