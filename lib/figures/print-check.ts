/**
 * The print check of a figure (issue 14): the rules a journal's figure guide and a careful reader
 * apply before the PI signs off, each one pure so it can be tested with seeded faults. The server
 * (lib/server/figures/print-check.ts) gathers the inputs: the composed figure SVG at its target
 * width, the panels' stored specs and words, the bound versions.
 *
 * Rules, as the checklist states them:
 * - text: every text of the composed SVG prints at ≥ 5 pt (journals ask 5–7 pt). The SVG's user
 *   units are points; a text's printed size is its font-size × the scale of every nested <svg>
 *   (width ÷ viewBox width, "meet") and transform around it, × the root's mm → pt scale.
 * - size: the drawn figure is its target width and no taller than the figure's maximum height.
 * - axes: every drawn x/y axis has a title (Vega-Lite's default, the column name, does not count);
 *   a quantitative axis's title ends in a unit in parentheses after a space — "τ (µs)", "PL (norm.)",
 *   "signal (a.u.)" — or its last word names a dimensionless quantity (DIMENSIONLESS_WORDS:
 *   "coherence", "normalised contrast", "residual"). Nominal, ordinal and time axes need a title only;
 *   an axis drawn without labels (one that shares its scale with a panel below) needs none.
 * - colours: the data colours of each panel (fills and strokes of its point, line, area, bar and tick
 *   marks; not rules, text, axes or legends, not white) are simulated for deuteranopia, protanopia and
 *   tritanopia with the Machado, Oliveira & Fernandes (2009) matrices at severity 1.0 and every pair
 *   must differ by CIEDE2000 ΔE00 ≥ MIN_CVD_DELTA_E00 under each. A mark group of more than
 *   CONTINUOUS_COLOURS colours is a continuous colour scale and is not compared pairwise.
 * - error bars: a panel that draws error bars (errorbar/errorband marks, xError/yError channels) says
 *   what they are — standard deviation, standard error, confidence interval, IQR, percentiles or
 *   min–max — in its own words (the spec's description or title, the panel title, the current
 *   revision's message), or the bound file's header defines the error column
 *   (`# sigma: standard error of the mean over 20 blocks`).
 * - n: a panel that summarises groups (an aggregate in an encoding or transform, an errorbar,
 *   errorband or boxplot over groups) states n: drawn in the panel ("n = 4") or written in its words.
 * - raster: every resolution the raster exports accept is ≥ 300 dpi.
 * - latest data: every bound dataset version (and every fitted input version) is its dataset's latest,
 *   unless the current revision's message keeps it on purpose ("keep version 1: …").
 */
import { converter, differenceCiede2000, parse, type Color } from "culori";

export type PrintCheckId = "text-size" | "figure-size" | "axis-units" | "colour-pairs" | "error-bars" | "group-n" | "raster-dpi" | "latest-data";

export interface PrintCheckItem {
  id: PrintCheckId;
  /** The rule in words, e.g. "Every text at least 5 pt at 183 mm". */
  label: string;
  ok: boolean;
  /** One sentence per failure, naming the panel. */
  problems: string[];
  /** What was found when it passes (or why nothing was there to check). */
  detail?: string;
  /** Latest data: the older versions that fail, each of which its panel could keep on purpose. */
  keep?: OlderVersion[];
}

/** An older dataset version a panel is bound to, which a new revision's message can keep on purpose. */
export interface OlderVersion {
  panelId: string;
  panel: string;
  dataset: string;
  number: number;
  latest: number;
}

export interface PrintCheck {
  ok: boolean;
  figureHash: string;
  items: PrintCheckItem[];
}

/** Journals ask for 5–7 pt text at the printed size. */
const MIN_TEXT_PT = 5;
/** Raster exports below this are refused by journals' artwork guides for line art and halftones alike. */
const MIN_RASTER_DPI = 300;
/**
 * Smallest CIEDE2000 difference between two data colours under each simulated deficiency. ΔE00 ≈ 1
 * is the just-noticeable difference for large uniform patches; plot marks are small and thin, so the
 * check asks for ten times that. Every pair of Okabe & Ito's palette passes (the closest: orange vs
 * reddish purple under tritanopia, ΔE00 10.87); Tableau's red and green (#D62728, #2CA02C) fail
 * under deuteranopia (ΔE00 4.61).
 */
export const MIN_CVD_DELTA_E00 = 10;
/** A mark group with more distinct colours than this draws a continuous colour scale. */
const CONTINUOUS_COLOURS = 12;

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

const PT_PER_MM = 72 / 25.4;
const round1 = (v: number) => (Math.round(v * 10) / 10).toFixed(1);
const quote = (s: string) => `“${s.length > 40 ? `${s.slice(0, 39)}…` : s}”`;
const inPanel = (letter: string | null) => (letter ? `panel ${letter}` : "the figure");

// ---------------------------------------------------------------------------------------------
// Reading the composed SVG

export interface SvgText {
  /** Panel letter from the composer's `<g class="panel panel-b">`, null outside a panel. */
  panel: string | null;
  text: string;
  /** Printed size, pt. */
  pt: number;
}

export interface SvgMarkColours {
  panel: string;
  /** Distinct colours (as written) of one data mark group. */
  colours: string[];
  /** A fill from a gradient (a colour bar or gradient mark). */
  gradient: boolean;
}

interface Frame {
  tag: string;
  scale: number;
  fontSize: number;
  panel: string | null;
  /** Inside a `role-mark` group of a data mark kind: its colour set. */
  marks: SvgMarkColours | null;
}

const attr = (attrs: string, name: string): string | null => {
  const m = new RegExp(`(?:^|\\s)${name}\\s*=\\s*(?:"([^"]*)"|'([^']*)')`).exec(attrs);
  return m ? (m[1] ?? m[2] ?? null) : null;
};
const styleProp = (attrs: string, name: string): string | null => {
  const style = attr(attrs, "style");
  if (!style) return null;
  const m = new RegExp(`(?:^|;)\\s*${name}\\s*:\\s*([^;]+)`).exec(style);
  return m ? m[1].trim() : null;
};
const prop = (attrs: string, name: string) => styleProp(attrs, name) ?? attr(attrs, name);

/** A length in user units (px and bare numbers; pt as CSS reads it, 4/3 px). */
function userLength(v: string | null, em: number): number | null {
  if (v === null) return null;
  const m = /^\s*(-?[\d.]+(?:e[-+]?\d+)?)\s*(px|pt|em|%)?\s*$/i.exec(v);
  if (!m) return null;
  const n = Number(m[1]);
  const unit = (m[2] ?? "").toLowerCase();
  if (unit === "pt") return (n * 4) / 3;
  if (unit === "em") return n * em;
  if (unit === "%") return (n / 100) * em;
  return n;
}

/** Area scale of an SVG transform list (√|det| of each function's linear part, multiplied). */
export function transformScale(transform: string | null): number {
  if (!transform) return 1;
  let k = 1;
  for (const m of transform.matchAll(/(\w+)\s*\(([^)]*)\)/g)) {
    const args = m[2]
      .split(/[\s,]+/)
      .filter(Boolean)
      .map(Number);
    if (m[1] === "scale") k *= Math.sqrt(Math.abs(args[0] * (args[1] ?? args[0])));
    else if (m[1] === "matrix" && args.length === 6) k *= Math.sqrt(Math.abs(args[0] * args[3] - args[1] * args[2]));
  }
  return k;
}

const DATA_MARKS = /\bmark-(symbol|line|area|rect|trail|arc|shape|path)\b/;
const decode = (s: string) =>
  s.replace(/&(lt|gt|amp|quot|apos|#\d+|#x[0-9a-f]+);/gi, (_, e: string) =>
    e[0] === "#"
      ? String.fromCodePoint(e[1].toLowerCase() === "x" ? parseInt(e.slice(2), 16) : Number(e.slice(1)))
      : ({ lt: "<", gt: ">", amp: "&", quot: '"', apos: "'" } as Record<string, string>)[e.toLowerCase()],
  );

/**
 * Every text of a composed figure SVG with its printed size in pt, and the colours of each panel's
 * data marks. Reads the SVG the composer writes (lib/server/render/worker/compose-core.mjs): a root in mm
 * with a viewBox in pt, one `<g class="panel panel-x">` per panel holding a nested `<svg>` scaled to its cell.
 */
export function readFigureSvg(svg: string): { texts: SvgText[]; marks: SvgMarkColours[] } {
  const texts: SvgText[] = [];
  const marks: SvgMarkColours[] = [];
  const stack: Frame[] = [];
  let text: { frame: Frame; content: string } | null = null;
  for (const m of svg.matchAll(/<(\/?)([a-zA-Z][\w:-]*)((?:[^>"']|"[^"]*"|'[^']*')*?)(\/?)>|([^<]+)/g)) {
    if (m[5] !== undefined) {
      if (text) text.content += m[5];
      continue;
    }
    const [, closing, tag, attrs, selfClosing] = m;
    if (closing) {
      const frame = stack.pop();
      if (frame && text && text.frame === frame) {
        const content = decode(text.content).replace(/\s+/g, " ").trim();
        if (content) texts.push({ panel: frame.panel, text: content, pt: frame.fontSize * frame.scale });
        text = null;
      }
      continue;
    }
    const parent = stack.at(-1) ?? { tag: "", scale: 1, fontSize: 16, panel: null, marks: null };
    let scale = parent.scale * transformScale(attr(attrs, "transform"));
    if (tag === "svg") {
      const box = attr(attrs, "viewBox")
        ?.split(/[\s,]+/)
        .map(Number);
      const w = attr(attrs, "width");
      const h = attr(attrs, "height");
      if (!stack.length) {
        // The root: width in mm (or pt), viewBox in pt-sized user units.
        const mm = w && /mm\s*$/.test(w) ? parseFloat(w) * PT_PER_MM : w ? userLength(w, 16) : null;
        if (box && box.length === 4 && mm && box[2] > 0) scale = mm / box[2];
      } else if (box && box.length === 4 && box[2] > 0 && box[3] > 0) {
        const kx = (userLength(w, parent.fontSize) ?? box[2]) / box[2];
        const ky = (userLength(h, parent.fontSize) ?? box[3]) / box[3];
        scale *= Math.min(kx, ky);
      }
    }
    const fontSize = userLength(prop(attrs, "font-size"), parent.fontSize) ?? parent.fontSize;
    const cls = attr(attrs, "class") ?? "";
    const panelClass = tag === "g" ? /(?:^|\s)panel-(\S+)/.exec(cls) : null;
    const panel = panelClass ? panelClass[1] : parent.panel;
    let group = parent.marks;
    if (tag === "g" && /\brole-mark\b/.test(cls) && panel) {
      group = DATA_MARKS.test(cls) ? { panel, colours: [], gradient: false } : null;
      if (group) marks.push(group);
    } else if (tag === "g" && /\brole-/.test(cls)) group = null;
    if (group && tag !== "g") {
      const opacity = Number(prop(attrs, "opacity") ?? 1);
      for (const paint of ["fill", "stroke"] as const) {
        const v = prop(attrs, paint);
        const paintOpacity = Number(prop(attrs, `${paint}-opacity`) ?? 1);
        if (!v || v === "none" || opacity === 0 || paintOpacity === 0) continue;
        if (paint === "stroke" && Number(prop(attrs, "stroke-width") ?? 1) === 0) continue;
        if (v.startsWith("url(")) group.gradient = true;
        else if (!group.colours.includes(v)) group.colours.push(v);
      }
    }
    const frame: Frame = { tag, scale, fontSize, panel, marks: group };
    if (selfClosing) continue;
    stack.push(frame);
    if (tag === "text") text = { frame, content: "" };
  }
  return { texts, marks };
}

// ---------------------------------------------------------------------------------------------
// Text and size

/** Repeated lines once, with how many times they occur (a label drawn once per row). */
function* counted(lines: string[]): Generator<string> {
  const n = new Map<string, number>();
  for (const l of lines) n.set(l, (n.get(l) ?? 0) + 1);
  for (const [l, k] of n) yield k > 1 ? `${l} (${k} times)` : l;
}

export function checkTextSizes(texts: SvgText[], widthMm: number, minPt = MIN_TEXT_PT): PrintCheckItem {
  const small = texts.filter((t) => t.pt < minPt - 1e-6);
  const smallest = texts.reduce((m, t) => Math.min(m, t.pt), Infinity);
  return {
    id: "text-size",
    label: `Every text at least ${minPt} pt at ${widthMm} mm wide`,
    ok: small.length === 0,
    problems: [...counted(small.map((t) => `${quote(t.text)} in ${inPanel(t.panel)} prints at ${round1(t.pt)} pt`))],
    detail: texts.length ? `smallest text ${round1(smallest)} pt` : "no text",
  };
}

export function checkFigureSize(f: { widthMm: number; heightMm: number; targetWidthMm: number; maxHeightMm: number }): PrintCheckItem {
  const problems: string[] = [];
  if (Math.abs(f.widthMm - f.targetWidthMm) > 0.05) problems.push(`the figure is ${round1(f.widthMm)} mm wide, not ${f.targetWidthMm} mm`);
  if (f.heightMm > f.maxHeightMm + 0.05) problems.push(`the figure is ${round1(f.heightMm)} mm tall, above its maximum of ${f.maxHeightMm} mm`);
  return {
    id: "figure-size",
    label: `Within ${f.targetWidthMm} mm wide and ${f.maxHeightMm} mm tall`,
    ok: problems.length === 0,
    problems,
    detail: `${round1(f.widthMm)} × ${round1(f.heightMm)} mm`,
  };
}

// ---------------------------------------------------------------------------------------------
// Walking a Vega-Lite spec

type Obj = Record<string, unknown>;
const isObj = (v: unknown): v is Obj => typeof v === "object" && v !== null && !Array.isArray(v);
const markType = (mark: unknown): string | null => (typeof mark === "string" ? mark : isObj(mark) && typeof mark.type === "string" ? mark.type : null);

/** One drawn view: a unit spec, or a layer with its units (encodings inherited as Vega-Lite does). */
interface View {
  units: Array<{ mark: unknown; encoding: Obj; transform: unknown[] }>;
}

function collectViews(spec: unknown): View[] {
  const views: View[] = [];
  const unitsOf = (node: Obj, encoding: Obj, transform: unknown[]): View["units"] => {
    const enc = { ...encoding, ...(isObj(node.encoding) ? node.encoding : {}) };
    const tr: unknown[] = [...transform, ...(Array.isArray(node.transform) ? (node.transform as unknown[]) : [])];
    if (Array.isArray(node.layer)) return node.layer.filter(isObj).flatMap((l) => unitsOf(l, enc, tr));
    return "mark" in node ? [{ mark: node.mark, encoding: enc, transform: tr }] : [];
  };
  const walk = (node: unknown) => {
    if (!isObj(node)) return;
    for (const key of ["vconcat", "hconcat", "concat"]) if (Array.isArray(node[key])) (node[key] as unknown[]).forEach(walk);
    if (isObj(node.spec)) walk(node.spec);
    if (Array.isArray(node.layer) || "mark" in node) views.push({ units: unitsOf(node, {}, []) });
  };
  walk(spec);
  return views;
}

// ---------------------------------------------------------------------------------------------
// Axes

export interface AxisInfo {
  channel: "x" | "y";
  /** The title as drawn; null when the spec gives none (or null). */
  title: string | null;
  type: string;
}

const titleText = (t: unknown): string | null | undefined =>
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

// ---------------------------------------------------------------------------------------------
// Colour vision deficiency

export type Deficiency = "deuteranopia" | "protanopia" | "tritanopia";
const DEFICIENCIES: Deficiency[] = ["deuteranopia", "protanopia", "tritanopia"];

/**
 * Machado, G. M., Oliveira, M. M. & Fernandes, L. A. F. (2009), "A Physiologically-based Model for
 * Simulation of Color Vision Deficiency", IEEE TVCG 15(6):1291–1298, doi:10.1109/TVCG.2009.113:
 * the precomputed matrices for severity 1.0 (dichromacy), rows r, g, b. They are linear maps of the
 * display's primaries, so they act on linear-light RGB (as the colorspace R package applies them).
 */
export const MACHADO_2009: Record<Deficiency, readonly [readonly number[], readonly number[], readonly number[]]> = {
  protanopia: [
    [0.152286, 1.052583, -0.204868],
    [0.114503, 0.786281, 0.099216],
    [-0.003882, -0.048116, 1.051998],
  ],
  deuteranopia: [
    [0.367322, 0.860646, -0.227968],
    [0.280085, 0.672501, 0.047413],
    [-0.01182, 0.04294, 0.968881],
  ],
  tritanopia: [
    [1.255528, -0.076749, -0.178779],
    [-0.078411, 0.930809, 0.147602],
    [0.004733, 0.691367, 0.3039],
  ],
};

const toLrgb = converter("lrgb");
const deltaE00 = differenceCiede2000();
const clamp01 = (v: number) => Math.min(1, Math.max(0, v));

/** A CSS colour as a dichromat sees it (sRGB in, linear RGB out, clipped to the gamut); undefined when unreadable. */
function simulateDeficiency(colour: string | Color, kind: Deficiency): Color | undefined {
  const c = toLrgb(typeof colour === "string" ? parse(colour) : colour);
  if (!c) return undefined;
  const [r, g, b] = MACHADO_2009[kind].map((row) => clamp01(row[0] * c.r + row[1] * c.g + row[2] * c.b));
  return { mode: "lrgb", r, g, b };
}

/** CIEDE2000 difference of two colours (Sharma, Wu & Dalal 2005), as seen with normal vision or a deficiency. */
export function cvdDeltaE(a: string, b: string, kind: Deficiency | "normal"): number {
  if (kind === "normal") return deltaE00(a, b);
  const sa = simulateDeficiency(a, kind);
  const sb = simulateDeficiency(b, kind);
  if (!sa || !sb) return Number.NaN;
  return deltaE00(sa, sb);
}

/** Opaque, readable, not the paper's white. */
function dataColour(c: string): string | null {
  const p = parse(c);
  if (!p || (p.alpha !== undefined && p.alpha === 0)) return null;
  const rgb = converter("rgb")(p);
  const hex = [rgb.r, rgb.g, rgb.b].map((v) => Math.round(clamp01(v) * 255));
  if (hex.every((v) => v === 255)) return null;
  return `#${hex.map((v) => v.toString(16).padStart(2, "0")).join("")}`;
}

export function checkColourPairs(marks: SvgMarkColours[], threshold = MIN_CVD_DELTA_E00): PrintCheckItem {
  const byPanel = new Map<string, Set<string>>();
  const continuous = new Set<string>();
  for (const m of marks) {
    const set = byPanel.get(m.panel) ?? new Set<string>();
    byPanel.set(m.panel, set);
    const colours = [...new Set(m.colours.map(dataColour).filter((c): c is string => c !== null))];
    if (m.gradient || colours.length > CONTINUOUS_COLOURS) {
      continuous.add(m.panel);
      continue;
    }
    colours.forEach((c) => set.add(c));
  }
  const problems: string[] = [];
  let pairs = 0;
  for (const [panel, set] of byPanel) {
    const colours = [...set].sort();
    for (let i = 0; i < colours.length; i++) {
      for (let j = i + 1; j < colours.length; j++) {
        pairs++;
        for (const kind of DEFICIENCIES) {
          const d = cvdDeltaE(colours[i], colours[j], kind);
          if (!(d >= threshold))
            problems.push(`panel ${panel}: ${colours[i]} and ${colours[j]} differ by ΔE00 ${round1(d)} under ${kind} (at least ${threshold})`);
        }
      }
    }
  }
  const notes = [`${pairs} colour pair${pairs === 1 ? "" : "s"}`];
  if (continuous.size) notes.push(`continuous colour scale in panel ${[...continuous].join(", ")} not compared pairwise`);
  return {
    id: "colour-pairs",
    label: `Data colours apart under deuteranopia, protanopia and tritanopia (ΔE00 ≥ ${threshold}, Machado 2009)`,
    ok: problems.length === 0,
    problems,
    detail: notes.join("; "),
  };
}

// ---------------------------------------------------------------------------------------------
// Error bars and n

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

// ---------------------------------------------------------------------------------------------
// Raster resolution and data versions

export function checkRasterDpi(accepted: number[], min = MIN_RASTER_DPI): PrintCheckItem {
  const low = accepted.filter((d) => d < min);
  return {
    id: "raster-dpi",
    label: `Raster exports at least ${min} dpi`,
    ok: low.length === 0 && accepted.length > 0,
    problems: low.map((d) => `raster exports accept ${d} dpi, below ${min}`),
    detail: `the PNG and TIFF exports offer ${accepted.join(", ")} dpi only`,
  };
}

export interface BoundVersion {
  panelId: string;
  panel: string;
  /** Data name in the spec. */
  name: string;
  dataset: string;
  number: number;
  latest: number;
  /** Via a fit: the version the analysis was run on. */
  viaAnalysis: boolean;
  /** The current revision's message of the panel. */
  message: string;
}

/** The revision message keeps this version on purpose: "keep version 1", "keeping v1 because …". */
export function keepsVersion(message: string, number: number): boolean {
  return new RegExp(`\\bkeep(?:s|ing)?\\b[^.;]*\\b(?:version|v)\\s*${number}\\b`, "i").test(message);
}

export function checkLatestVersions(bound: BoundVersion[]): PrintCheckItem {
  const problems: string[] = [];
  const keep: OlderVersion[] = [];
  let kept = 0;
  for (const b of bound) {
    if (b.number >= b.latest) continue;
    if (keepsVersion(b.message, b.number)) {
      kept++;
      continue;
    }
    if (!keep.some((k) => k.panelId === b.panelId && k.dataset === b.dataset && k.number === b.number))
      keep.push({ panelId: b.panelId, panel: b.panel, dataset: b.dataset, number: b.number, latest: b.latest });
    const what = b.viaAnalysis ? `the fit bound as “${b.name}” was run on` : `“${b.name}” is bound to`;
    problems.push(
      `panel ${b.panel}: ${what} ${quote(b.dataset)} version ${b.number}, but version ${b.latest} is the latest — rebind it, or keep version ${b.number} on purpose with a reason (saved as a revision note: “keep version ${b.number}: …”)`,
    );
  }
  return {
    id: "latest-data",
    label: "Every panel bound to its dataset's latest version (or kept on purpose)",
    ok: problems.length === 0,
    problems,
    ...(keep.length ? { keep } : {}),
    detail: `${bound.length} bound version${bound.length === 1 ? "" : "s"}${kept ? `, ${kept} older one${kept === 1 ? "" : "s"} kept on purpose` : ""}`,
  };
}

// ---------------------------------------------------------------------------------------------

/** One line per failure, "rule: problem", for the sign-off's reason prompt and its audit entry. */
export function printCheckFailures(check: PrintCheck): string[] {
  return check.items.flatMap((i) => (i.ok ? [] : i.problems.length ? i.problems.map((p) => `${i.label}: ${p}`) : [i.label]));
}
