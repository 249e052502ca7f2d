/**
 * Parameter by group (T1/T2 of many centres per sample): every value as a point with a
 * deterministic jitter, the group summary (mean ± sd, or median and interquartile range) and
 * n written above each group.
 */
import type { TopLevelSpec } from "vega-lite";
import { axisTitle, OKABE_ITO, SCALE_CHOICES, type ScaleKind, scaleFor, singleViewFrame, type Spec, vlField, withPrint } from "./print";
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

export const GROUP_STRIP_DEFAULTS: GroupStripOptions = {
  dataName: "population", groupField: "sample", valueField: "T2", groupName: "sample", valueName: "T₂", unit: "µs",
  summary: "mean-sd", yScale: "linear",
};

function build(input: Partial<GroupStripOptions>): TopLevelSpec {
  const o = { ...GROUP_STRIP_DEFAULTS, ...input };
  const group = vlField(o.groupField);
  const value = vlField(o.valueField);
  const yTitle = axisTitle(o.valueName, o.unit);
  const x: Spec = { field: group, type: "nominal", title: o.groupName, axis: { labelAngle: 0 } };
  const y: Spec = { field: value, type: "quantitative", title: yTitle, scale: scaleFor(o.yScale) };
  const median = o.summary === "median-iqr";
  return {
    ...singleViewFrame(withPrint(o.print), `${o.valueName} by ${o.groupName}, ${median ? "median and IQR" : "mean ± sd"}, n per group`),
    data: { name: o.dataName },
    transform: [
      // Golden-ratio jitter from the row number: spread like random, but the same on every render.
      { window: [{ op: "row_number", as: "strip_row" }], groupby: [group] },
      { calculate: "(datum.strip_row * 0.6180339887) % 1 - 0.5", as: "strip_jitter" },
    ],
    layer: [
      {
        mark: { type: "point", opacity: 0.75 },
        encoding: {
          x, y,
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
    ],
  } as unknown as TopLevelSpec;
}

export const groupStripTemplate: FigureTemplate<GroupStripOptions> = {
  id: "group-strip",
  title: "Parameter by group (strip plot)",
  description: "One point per centre, grouped by sample, with mean ± sd or median and IQR, and n shown per group.",
  options: [
    { key: "dataName", label: "Population table", kind: "data-name", binds: "dataset", required: true, default: "population" },
    { key: "groupField", label: "Group column", kind: "column", dataKey: "dataName", required: true, default: "sample" },
    { key: "valueField", label: "Value column", kind: "column", dataKey: "dataName", required: true, default: "T2" },
    { key: "groupName", label: "Group axis name", kind: "text", default: "sample" },
    { key: "valueName", label: "Value axis name", kind: "text", default: "T₂" },
    { key: "unit", label: "Value unit", kind: "text", default: "µs" },
    { key: "summary", label: "Summary", kind: "select", default: "mean-sd", choices: [
      { value: "mean-sd", label: "mean ± sd" }, { value: "median-iqr", label: "median and IQR" }] },
    { key: "yScale", label: "Value axis", kind: "select", choices: SCALE_CHOICES, default: "linear" },
  ],
  dataNames: (input) => {
    const o = { ...GROUP_STRIP_DEFAULTS, ...input };
    return [o.dataName];
  },
  build,
};
