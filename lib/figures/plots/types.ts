/** What a builder template tells the UI about itself: enough to draw its options as a form. */
import type { TopLevelSpec } from "vega-lite";
import { TICK_FORMATS, type PrintSettings } from "./print";

interface FieldBase {
  key: string;
  label: string;
  help?: string;
  required?: boolean;
}

/** One entry of a template's option form. */
export type TemplateOptionField =
  /** A data name the spec reads; `binds` says what the UI should offer to bind it to. */
  | (FieldBase & { kind: "data-name"; binds: "dataset" | "analysis-curve" | "analysis-residuals"; default?: string })
  /** A column of the data named by the option `dataKey`. */
  | (FieldBase & { kind: "column"; dataKey: string; default?: string })
  | (FieldBase & { kind: "text"; default?: string })
  | (FieldBase & { kind: "number"; default?: number; min?: number; max?: number; unit?: string })
  | (FieldBase & { kind: "select"; choices: Array<{ value: string; label: string }>; default: string })
  | (FieldBase & { kind: "boolean"; default: boolean })
  /** A list of labelled positions on the x axis (marker lines). */
  | (FieldBase & { kind: "markers"; default: Marker[] });

export interface Marker {
  /** Position in the x axis' unit. */
  position: number;
  label: string;
}

export interface CommonOptions {
  print?: Partial<PrintSettings>;
}

/** Names and units of the x and y axes, written in the axis titles as "τ (µs)". */
export interface XYAxisText {
  xName: string;
  xUnit: string;
  yName: string;
  yUnit: string;
}

export interface FigureTemplate<O extends CommonOptions = CommonOptions> {
  id: string;
  title: string;
  description: string;
  /** The form; print settings (width, height, font sizes) are common to all and not repeated. */
  options: TemplateOptionField[];
  /** Data names the built spec reads, for these options (what must be bound); defaults fill the gaps. */
  dataNames(options: Partial<O>): string[];
  /** Ordinary Vega-Lite the user can go on to edit; defaults fill the options not given. */
  build(options: Partial<O>): TopLevelSpec;
}

/** The print-settings part of every template's form. */
export const PRINT_OPTION_FIELDS: TemplateOptionField[] = [
  {
    key: "print.widthMm",
    label: "Width",
    kind: "number",
    default: 89,
    min: 20,
    max: 300,
    unit: "mm",
    help: "single column 89 mm, 1.5 column 120 mm, double 183 mm",
  },
  { key: "print.heightMm", label: "Height", kind: "number", default: 62, min: 15, max: 250, unit: "mm" },
  { key: "print.labelPt", label: "Label size", kind: "number", default: 7, min: 5, max: 12, unit: "pt" },
  { key: "print.titlePt", label: "Title size", kind: "number", default: 8, min: 5, max: 14, unit: "pt" },
  { key: "print.xFormat", label: "x tick numbers", kind: "select", choices: TICK_FORMATS, default: "plain" },
  { key: "print.yFormat", label: "y tick numbers", kind: "select", choices: TICK_FORMATS, default: "plain" },
];
