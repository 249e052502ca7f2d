/**
 * A manuscript's house style: the font family, text sizes, line widths and panel-letter look every
 * export of its figures uses. Applied to a panel's spec at render time (the stored revision is
 * untouched), so one change restyles every figure of the manuscript.
 *
 * Journals ask for 5–7 pt text at the printed size and lines of at least 0.25 pt (common practice;
 * each journal's figure guide states its own numbers).
 */
import { z } from "zod";

/** The faces shipped with the app (the server never uses system fonts). */
export const HOUSE_FONTS = {
  Inter: { label: "Inter", browser: "Inter, sans-serif" },
  Arimo: { label: "Arimo (the metrics of Arial and Helvetica)", browser: "Arimo, Arial, Helvetica, sans-serif" },
} as const;
export type HouseFont = keyof typeof HOUSE_FONTS;

const pt = (what: string, min: number, max: number) =>
  z
    .number({ message: `${what} must be a number of points` })
    .min(min, `${what} must be at least ${min} pt`)
    .max(max, `${what} must be at most ${max} pt`);

export const houseStyleSchema = z
  .object({
    font: z.enum(Object.keys(HOUSE_FONTS) as [HouseFont, ...HouseFont[]], { message: `font must be one of ${Object.keys(HOUSE_FONTS).join(", ")}` }),
    /** Tick and legend labels. */
    labelPt: pt("labelPt", 5, 12),
    /** Axis and legend titles. */
    titlePt: pt("titlePt", 5, 14),
    /** Axis lines and ticks. */
    axisLinePt: pt("axisLinePt", 0.25, 2),
    /** Lines drawn from data (curves, fits); null keeps each panel's own widths. */
    dataLinePt: pt("dataLinePt", 0.25, 3).nullable(),
    letterPt: pt("letterPt", 6, 14),
    letterCase: z.enum(["lower", "upper"], { message: "letterCase must be lower or upper" }),
    letterWeight: z.enum(["bold", "normal"], { message: "letterWeight must be bold or normal" }),
  })
  .strict();
export type HouseStyle = z.infer<typeof houseStyleSchema>;

/** What a manuscript without a house style gets: the builder templates' own sizes. */
export const DEFAULT_HOUSE_STYLE: HouseStyle = {
  font: "Inter",
  labelPt: 7,
  titlePt: 8,
  axisLinePt: 0.6,
  dataLinePt: null,
  letterPt: 8,
  letterCase: "lower",
  letterWeight: "bold",
};

/** A stored value (possibly partial or from an older version) read as a whole style; unknown or bad fields fall back to the defaults. */
export function readHouseStyle(stored: unknown): HouseStyle {
  if (!stored || typeof stored !== "object") return DEFAULT_HOUSE_STYLE;
  const merged = { ...DEFAULT_HOUSE_STYLE };
  for (const key of Object.keys(DEFAULT_HOUSE_STYLE) as (keyof HouseStyle)[]) {
    const field = houseStyleSchema.shape[key].safeParse((stored as Record<string, unknown>)[key]);
    if (field.success) Object.assign(merged, { [key]: field.data });
  }
  return merged;
}

type Json = { [key: string]: unknown };
const isObject = (v: unknown): v is Json => !!v && typeof v === "object" && !Array.isArray(v);

/** The config keys the house style owns; a spec's own values for them are replaced. */
function styleConfig(style: HouseStyle, browser: boolean): Json {
  const font = browser ? HOUSE_FONTS[style.font].browser : style.font;
  const text = { labelFont: font, titleFont: font, labelFontSize: style.labelPt, titleFontSize: style.titlePt };
  return {
    font,
    axis: { ...text, domainWidth: style.axisLinePt, tickWidth: style.axisLinePt },
    legend: text,
    header: text,
    title: { font },
    text: { font, fontSize: style.labelPt },
    ...(style.dataLinePt === null ? {} : { line: { strokeWidth: style.dataLinePt } }),
  };
}

function mergeConfig(own: unknown, style: Json): Json {
  const out: Json = isObject(own) ? { ...own } : {};
  for (const [k, v] of Object.entries(style)) out[k] = isObject(v) && isObject(out[k]) ? { ...out[k], ...v } : v;
  return out;
}

/** Line marks set their own widths in the templates; the house style's data-line width replaces them. */
function restyleLineMarks(node: unknown, width: number): unknown {
  if (Array.isArray(node)) return node.map((n) => restyleLineMarks(n, width));
  if (!isObject(node)) return node;
  const out: Json = {};
  for (const [k, v] of Object.entries(node)) {
    if (k === "data" || k === "datasets" || k === "usermeta" || k === "config" || k === "encoding" || k === "transform") out[k] = v;
    else if (k === "mark" && isObject(v) && v.type === "line" && "strokeWidth" in v) out[k] = { ...v, strokeWidth: width };
    else out[k] = restyleLineMarks(v, width);
  }
  return out;
}

/**
 * The spec as the house style prints it: fonts, text sizes and line widths set in its top-level
 * config. `browser` names the font with fallbacks of the same metrics for an on-screen preview
 * (the server renderers take the bare family they ship).
 */
export function applyHouseStyle<T>(spec: T, style: HouseStyle, { browser = false } = {}): T {
  if (!isObject(spec)) return spec;
  const restyled = style.dataLinePt === null ? spec : (restyleLineMarks(spec, style.dataLinePt) as Json);
  return { ...restyled, config: mergeConfig(spec.config, styleConfig(style, browser)) } as T;
}

/** The printed panel letter: "a" or "A". */
export function panelLetter(letter: string, style: HouseStyle): string {
  return style.letterCase === "upper" ? letter.toUpperCase() : letter.toLowerCase();
}

/** One line for the figure page and the export trace: "Arimo, labels 6 pt, titles 7 pt, axes 0.5 pt, letters A 8 pt bold". */
export function describeHouseStyle(style: HouseStyle): string {
  const lines = `axes ${style.axisLinePt} pt${style.dataLinePt === null ? "" : `, data lines ${style.dataLinePt} pt`}`;
  return `${style.font}, labels ${style.labelPt} pt, titles ${style.titlePt} pt, ${lines}, letters ${panelLetter("a", style)} ${style.letterPt} pt ${style.letterWeight}`;
}
