/** Generic scatter and/or line plot with optional ±σ error bars and an optional series colour. */
import type { TopLevelSpec } from "vega-lite";
import { axisTitle, OKABE_ITO, quantitative, type ScaleKind, scaleFor, singleViewPanel, type Spec, vlField, withPrint } from "./print";
import { axisTextOptions, dataNamesOf, dataOptions, scaleOption, SIGMA_COLUMN_OPTION } from "./template-options";
import type { CommonOptions, FigureTemplate, XYAxisText } from "./types";

export interface ScatterLineOptions extends CommonOptions, XYAxisText {
  dataName: string;
  xField: string;
  yField: string;
  sigmaField?: string;
  /** Column splitting the rows into coloured series; empty for one series. */
  colorField?: string;
  marks: "points" | "line" | "line+points";
  xScale: ScaleKind;
  yScale: ScaleKind;
}

const SCATTER_LINE_DEFAULTS: ScatterLineOptions = {
  dataName: "data",
  xField: "x",
  yField: "y",
  sigmaField: "",
  colorField: "",
  marks: "points",
  xName: "x",
  xUnit: "",
  yName: "y",
  yUnit: "",
  xScale: "linear",
  yScale: "linear",
};

function build(input: Partial<ScatterLineOptions>): TopLevelSpec {
  const o = { ...SCATTER_LINE_DEFAULTS, ...input };
  const x = quantitative(o.xField, axisTitle(o.xName, o.xUnit), scaleFor(o.xScale));
  const y = quantitative(o.yField, axisTitle(o.yName, o.yUnit), scaleFor(o.yScale));
  const color: Spec = o.colorField ? { color: { field: vlField(o.colorField), type: "nominal", legend: { title: null, orient: "top-right" } } } : {};
  const fixed = o.colorField ? {} : { color: OKABE_ITO.blue };
  const layers: Spec[] = [];
  if (o.sigmaField) {
    layers.push({ mark: { type: "errorbar", thickness: 0.6, ...fixed }, encoding: { x, y, yError: { field: vlField(o.sigmaField) }, ...color } });
  }
  if (o.marks !== "points") layers.push({ mark: { type: "line", ...fixed }, encoding: { x, y, ...color } });
  if (o.marks !== "line") layers.push({ mark: { type: "point", ...fixed }, encoding: { x, y, ...color } });
  return singleViewPanel(withPrint(o.print), `${o.yName} against ${o.xName}`, { data: { name: o.dataName } }, layers);
}

export const scatterLineTemplate: FigureTemplate<ScatterLineOptions> = {
  id: "scatter-line",
  title: "Scatter or line plot",
  description: "Any two columns as points and/or a line, with optional ± σ error bars and series colours.",
  options: [
    ...dataOptions("Data", "data", [
      ["xField", "x column", "x"],
      ["yField", "y column", "y"],
    ]),
    SIGMA_COLUMN_OPTION,
    { key: "colorField", label: "Series column", kind: "column", dataKey: "dataName" },
    {
      key: "marks",
      label: "Draw",
      kind: "select",
      default: "points",
      choices: [
        { value: "points", label: "points" },
        { value: "line", label: "line" },
        { value: "line+points", label: "line and points" },
      ],
    },
    ...axisTextOptions("x", ["xName", "x"], ["xUnit", ""]),
    ...axisTextOptions("y", ["yName", "y"], ["yUnit", ""]),
    scaleOption("xScale", "x axis"),
    scaleOption("yScale", "y axis"),
  ],
  dataNames: dataNamesOf(SCATTER_LINE_DEFAULTS, ["dataName"]),
  build,
};
