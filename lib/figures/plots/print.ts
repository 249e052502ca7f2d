/**
 * Print settings shared by the builder templates: sizes in points (1 pt = 1/72 in; Vega's "px"
 * are read as pt by the server renderer), Inter at 7 pt labels / 8 pt titles, the Okabe–Ito
 * colour-blind-safe palette, and helpers for field names, expressions and axis titles.
 */
import type { TopLevelSpec } from "vega-lite";

export type Spec = { [key: string]: unknown };

const VEGA_LITE_SCHEMA_URL = "https://vega.github.io/schema/vega-lite/v6.json";

/** Okabe & Ito (2008), "Color Universal Design": distinguishable with the common colour-vision deficiencies. */
export const OKABE_ITO = {
  black: "#000000",
  orange: "#E69F00",
  skyBlue: "#56B4E9",
  bluishGreen: "#009E73",
  yellow: "#F0E442",
  blue: "#0072B2",
  vermillion: "#D55E00",
  reddishPurple: "#CC79A7",
} as const;

/** Category order: strong hues first, yellow (weak on white paper) last. */
const OKABE_ITO_CATEGORY = [
  OKABE_ITO.blue,
  OKABE_ITO.vermillion,
  OKABE_ITO.bluishGreen,
  OKABE_ITO.orange,
  OKABE_ITO.reddishPurple,
  OKABE_ITO.skyBlue,
  OKABE_ITO.black,
  OKABE_ITO.yellow,
];

const PT_PER_MM = 72 / 25.4;
export const mmToPt = (mm: number): number => Math.round(mm * PT_PER_MM * 100) / 100;

export interface PrintSettings {
  /** Panel width, mm (single column 89, 1.5 column 120, double 183). */
  widthMm: number;
  /** Panel height, mm. */
  heightMm: number;
  /** Axis tick labels and legend labels, pt. */
  labelPt: number;
  /** Axis and legend titles, pt. */
  titlePt: number;
  /** Tick numbers of the x and y axes: "plain" (the journal default) or a d3-format specifier from TICK_FORMATS. */
  xFormat?: string;
  yFormat?: string;
}

const DEFAULT_PRINT: PrintSettings = { widthMm: 89, heightMm: 62, labelPt: 7, titlePt: 8, xFormat: "plain", yFormat: "plain" };

/** Tick-number styles (d3-format specifiers); "plain" keeps the config's numberFormat: no thousands separators, precision from the tick step. */
export const TICK_FORMATS = [
  { value: "plain", label: "plain (2700, 0.25)" },
  { value: ".0f", label: "whole numbers (2700)" },
  { value: ".1f", label: "one decimal (2700.0)" },
  { value: ".2f", label: "two decimals (0.25)" },
  { value: ".3f", label: "three decimals (0.250)" },
  { value: ".0e", label: "powers of ten (3e+3)" },
  { value: ".1e", label: "scientific, one decimal (2.7e+3)" },
];
const tickFormat = (f: string | undefined) => (f && f !== "plain" && TICK_FORMATS.some((t) => t.value === f) ? { format: f } : null);

export type ScaleKind = "linear" | "log" | "symlog";
export const SCALE_CHOICES = [
  { value: "linear", label: "linear" },
  { value: "log", label: "logarithmic" },
  { value: "symlog", label: "symmetric log (passes through zero)" },
];

/** "τ (µs)"; a name with no unit stays bare (the one formatter, re-exported for the templates). */
export { axisTitle } from "@/lib/data/format";

/** A column name as a Vega-Lite `field` (dots and brackets would otherwise mean nesting). */
export function vlField(column: string): string {
  return column.replace(/[.[\]\\]/g, "\\$&");
}

/** A column read inside an expression: datum["tau (µs)"]. */
export function datumRef(column: string): string {
  return `datum[${JSON.stringify(column)}]`;
}

/** Expression selecting one series of an analysis output (curve, data or residual rows). */
export function seriesFilter(seriesColumn: string, series: "curve" | "data" | "residual"): string {
  return `${datumRef(seriesColumn)} === '${series}'`;
}

/** A quantitative position channel on a column, with its axis title and scale. */
export function quantitative(column: string, title: string, scale: Spec): Spec {
  return { field: vlField(column), type: "quantitative", title, scale };
}

export function scaleFor(kind: ScaleKind, extra: Spec = {}): Spec {
  if (kind === "linear") return { zero: false, ...extra };
  if (kind === "symlog") return { type: "symlog", ...extra };
  return { type: "log", ...extra };
}

/** Vega-Lite config for print: Inter, sizes in pt, thin black axes, no grid, Okabe–Ito categories, plain numbers. */
function printConfig(p: PrintSettings): Spec {
  const axisLine = { domainColor: "#000000", tickColor: "#000000", domainWidth: 0.6, tickWidth: 0.6 };
  return {
    font: "Inter",
    // Journals print numbers without thousands separators: "2700", not "2,700" (precision follows the tick step).
    numberFormat: "~f",
    background: "white",
    padding: 2,
    view: { stroke: null },
    axis: {
      ...axisLine,
      labelFont: "Inter",
      titleFont: "Inter",
      labelFontSize: p.labelPt,
      titleFontSize: p.titlePt,
      titleFontWeight: "normal",
      labelColor: "#000000",
      titleColor: "#000000",
      tickSize: 3,
      labelPadding: 2,
      titlePadding: 3,
      grid: false,
    },
    legend: {
      labelFont: "Inter",
      titleFont: "Inter",
      labelFontSize: p.labelPt,
      titleFontSize: p.titlePt,
      titleFontWeight: "normal",
      symbolSize: 24,
      gradientThickness: 6,
      padding: 0,
      rowPadding: 2,
    },
    ...(tickFormat(p.xFormat) ? { axisX: tickFormat(p.xFormat) } : {}),
    ...(tickFormat(p.yFormat) ? { axisY: tickFormat(p.yFormat) } : {}),
    header: { labelFont: "Inter", titleFont: "Inter", labelFontSize: p.labelPt, titleFontSize: p.titlePt },
    title: { font: "Inter", fontSize: p.titlePt, fontWeight: "bold", anchor: "start" },
    text: { font: "Inter", fontSize: p.labelPt },
    range: { category: OKABE_ITO_CATEGORY },
    point: { size: 9, filled: true, strokeWidth: 0 },
    line: { strokeWidth: 1 },
    rule: { strokeWidth: 0.6 },
    tick: { thickness: 1 },
    concat: { spacing: 4 },
  };
}

/** Top-level frame of a single-view (or layered) panel that fills its printed size exactly. */
function singleViewFrame(p: PrintSettings, description: string): Spec {
  return {
    $schema: VEGA_LITE_SCHEMA_URL,
    description,
    width: mmToPt(p.widthMm),
    height: mmToPt(p.heightMm),
    autosize: { type: "fit", contains: "padding" },
    config: printConfig(p),
  };
}

/** A single-view panel: the frame, then what the layers share (`top`: data, transforms), then the layers. */
export function singleViewPanel(p: PrintSettings, description: string, top: Spec, layers: Spec[]): TopLevelSpec {
  return { ...singleViewFrame(p, description), ...top, layer: layers } as unknown as TopLevelSpec;
}

/** Top-level frame of a stacked (vconcat) panel; the renderer scales it to the printed width. */
export function concatFrame(p: PrintSettings, description: string): Spec {
  return { $schema: VEGA_LITE_SCHEMA_URL, description, config: printConfig(p) };
}

/** Plot-area width of a stacked panel: the printed width less room for the y axis and padding. */
export const innerWidthPt = (p: PrintSettings): number => Math.max(40, mmToPt(p.widthMm) - 40);

export function withPrint(print: Partial<PrintSettings> | undefined): PrintSettings {
  return { ...DEFAULT_PRINT, ...(print ?? {}) };
}
