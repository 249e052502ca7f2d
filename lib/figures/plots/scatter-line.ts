/** Generic scatter and/or line plot with optional ±σ error bars and an optional series colour. */
import type { TopLevelSpec } from "vega-lite";
import { axisTitle, OKABE_ITO, SCALE_CHOICES, type ScaleKind, scaleFor, singleViewFrame, type Spec, vlField, withPrint } from "./print";
import type { CommonOptions, FigureTemplate } from "./types";

export interface ScatterLineOptions extends CommonOptions {
  dataName: string;
  xField: string;
  yField: string;
  sigmaField?: string;
  /** Column splitting the rows into coloured series; empty for one series. */
  colorField?: string;
  marks: "points" | "line" | "line+points";
  xName: string;
  xUnit: string;
  yName: string;
  yUnit: string;
  xScale: ScaleKind;
  yScale: ScaleKind;
}

export const SCATTER_LINE_DEFAULTS: ScatterLineOptions = {
  dataName: "data", xField: "x", yField: "y", sigmaField: "", colorField: "", marks: "points",
  xName: "x", xUnit: "", yName: "y", yUnit: "", xScale: "linear", yScale: "linear",
};

function build(input: Partial<ScatterLineOptions>): TopLevelSpec {
  const o = { ...SCATTER_LINE_DEFAULTS, ...input };
  const x: Spec = { field: vlField(o.xField), type: "quantitative", title: axisTitle(o.xName, o.xUnit), scale: scaleFor(o.xScale) };
  const y: Spec = { field: vlField(o.yField), type: "quantitative", title: axisTitle(o.yName, o.yUnit), scale: scaleFor(o.yScale) };
  const color: Spec = o.colorField
    ? { color: { field: vlField(o.colorField), type: "nominal", legend: { title: null, orient: "top-right" } } }
    : {};
  const fixed = o.colorField ? {} : { color: OKABE_ITO.blue };
  const layers: Spec[] = [];
  if (o.sigmaField) {
    layers.push({ mark: { type: "errorbar", thickness: 0.6, ...fixed }, encoding: { x, y, yError: { field: vlField(o.sigmaField) }, ...color } });
  }
  if (o.marks !== "points") layers.push({ mark: { type: "line", ...fixed }, encoding: { x, y, ...color } });
  if (o.marks !== "line") layers.push({ mark: { type: "point", ...fixed }, encoding: { x, y, ...color } });
  return {
    ...singleViewFrame(withPrint(o.print), `${o.yName} against ${o.xName}`),
    data: { name: o.dataName },
    layer: layers,
  } as unknown as TopLevelSpec;
}

export const scatterLineTemplate: FigureTemplate<ScatterLineOptions> = {
  id: "scatter-line",
  title: "Scatter or line plot",
  description: "Any two columns as points and/or a line, with optional ± σ error bars and series colours.",
  options: [
    { key: "dataName", label: "Data", kind: "data-name", binds: "dataset", required: true, default: "data" },
    { key: "xField", label: "x column", kind: "column", dataKey: "dataName", required: true, default: "x" },
    { key: "yField", label: "y column", kind: "column", dataKey: "dataName", required: true, default: "y" },
    { key: "sigmaField", label: "σ column (error bars)", kind: "column", dataKey: "dataName" },
    { key: "colorField", label: "Series column", kind: "column", dataKey: "dataName" },
    { key: "marks", label: "Draw", kind: "select", default: "points", choices: [
      { value: "points", label: "points" }, { value: "line", label: "line" }, { value: "line+points", label: "line and points" }] },
    { key: "xName", label: "x axis name", kind: "text", default: "x" },
    { key: "xUnit", label: "x unit", kind: "text", default: "" },
    { key: "yName", label: "y axis name", kind: "text", default: "y" },
    { key: "yUnit", label: "y unit", kind: "text", default: "" },
    { key: "xScale", label: "x axis", kind: "select", choices: SCALE_CHOICES, default: "linear" },
    { key: "yScale", label: "y axis", kind: "select", choices: SCALE_CHOICES, default: "linear" },
  ],
  dataNames: (input) => {
    const o = { ...SCATTER_LINE_DEFAULTS, ...input };
    return [o.dataName];
  },
  build,
};
