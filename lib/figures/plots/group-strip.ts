/**
 * Parameter by group (T1/T2 of many centres per sample): every value as a point with a
 * deterministic jitter, the group summary (mean ± sd, or median and interquartile range) and
 * n written above each group.
 */
import type { TopLevelSpec } from "vega-lite";
import { axisTitle, OKABE_ITO, quantitative, type ScaleKind, scaleFor, singleViewPanel, type Spec, vlField, withPrint } from "./print";
import { axisTextOptions, dataNamesOf, dataOptions, scaleOption } from "./template-options";
import type { CommonOptions, FigureTemplate } from "./types";

export interface GroupStripOptions extends CommonOptions {
  dataName: string;
  groupField: string;
  valueField: string;
  groupName: string;
  valueName: string;
  unit: string;
  summary: "mean-sd" | "median-iqr";
  yScale: ScaleKind;
}

const GROUP_STRIP_DEFAULTS: GroupStripOptions = {
  dataName: "population",
  groupField: "sample",
  valueField: "T2",
  groupName: "sample",
  valueName: "T₂",
  unit: "µs",
  summary: "mean-sd",
  yScale: "linear",
};

function build(input: Partial<GroupStripOptions>): TopLevelSpec {
  const o = { ...GROUP_STRIP_DEFAULTS, ...input };
  const group = vlField(o.groupField);
  const yTitle = axisTitle(o.valueName, o.unit);
  const x: Spec = { field: group, type: "nominal", title: o.groupName, axis: { labelAngle: 0 } };
  const y = quantitative(o.valueField, yTitle, scaleFor(o.yScale));
  const median = o.summary === "median-iqr";
  const description = `${o.valueName} by ${o.groupName}, ${median ? "median and IQR" : "mean ± sd"}, n per group`;
  const shared: Spec = {
    data: { name: o.dataName },
    transform: [
      // Golden-ratio jitter from the row number: spread like random, but the same on every render.
      { window: [{ op: "row_number", as: "strip_row" }], groupby: [group] },
      { calculate: "(datum.strip_row * 0.6180339887) % 1 - 0.5", as: "strip_jitter" },
    ],
  };
  return singleViewPanel(withPrint(o.print), description, shared, [
    {
      mark: { type: "point", opacity: 0.75 },
      encoding: {
        x,
        y,
        xOffset: { field: "strip_jitter", type: "quantitative", scale: { domain: [-1, 1] } },
        color: { field: group, type: "nominal", legend: null },
      },
    },
    {
      mark: { type: "errorbar", extent: median ? "iqr" : "stdev", ticks: { size: 8 }, color: OKABE_ITO.black, thickness: 0.8 },
      encoding: { x, y },
    },
    {
      mark: { type: "tick", color: OKABE_ITO.black, thickness: 1.2, size: 14 },
      encoding: { x, y: { ...y, aggregate: median ? "median" : "mean" } },
    },
    {
      transform: [
        { aggregate: [{ op: "count", as: "strip_n" }], groupby: [group] },
        { calculate: "'n = ' + datum.strip_n", as: "strip_label" },
      ],
      mark: { type: "text", baseline: "bottom", dy: -2 },
      encoding: { x, y: { value: 0 }, text: { field: "strip_label", type: "nominal" } },
    },
  ]);
}

export const groupStripTemplate: FigureTemplate<GroupStripOptions> = {
  id: "group-strip",
  title: "Parameter by group (strip plot)",
  description: "One point per centre, grouped by sample, with mean ± sd or median and IQR, and n shown per group.",
  options: [
    ...dataOptions("Population table", "population", [
      ["groupField", "Group column", "sample"],
      ["valueField", "Value column", "T2"],
    ]),
    ...axisTextOptions("Group", ["groupName", "sample"]),
    ...axisTextOptions("Value", ["valueName", "T₂"], ["unit", "µs"]),
    {
      key: "summary",
      label: "Summary",
      kind: "select",
      default: "mean-sd",
      choices: [
        { value: "mean-sd", label: "mean ± sd" },
        { value: "median-iqr", label: "median and IQR" },
      ],
    },
    scaleOption("yScale", "Value axis"),
  ],
  dataNames: dataNamesOf(GROUP_STRIP_DEFAULTS, ["dataName"]),
  build,
};
