/**
 * Confocal PL map: one rectangle per scan pixel coloured by count rate, a colour bar in
 * kcounts/s and a scale bar drawn in data coordinates at the lower right of the scanned area.
 */
import type { TopLevelSpec } from "vega-lite";
import { axisTitle, datumRef, mmToPt, quantitative, singleViewPanel, type Spec, vlField, withPrint } from "./print";
import { dataNamesOf, dataOptions } from "./template-options";
import type { CommonOptions, FigureTemplate } from "./types";

export interface PlMapOptions extends CommonOptions {
  dataName: string;
  xField: string;
  yField: string;
  valueField: string;
  /** Scan step (pixel pitch), µm; the coordinates are pixel centres. */
  pixelUm: number;
  /** Scale-bar length, µm; 0 for none. */
  scaleBarUm: number;
  colorScheme: "viridis" | "cividis" | "magma" | "greys";
  colorTitle: string;
  /** Axis names; the position unit is written after them. */
  xName: string;
  yName: string;
  unit: string;
}

const PL_MAP_DEFAULTS: PlMapOptions = {
  dataName: "plmap",
  xField: "x",
  yField: "y",
  valueField: "counts",
  pixelUm: 0.2,
  scaleBarUm: 5,
  colorScheme: "viridis",
  colorTitle: "count rate (kcounts/s)",
  xName: "x",
  yName: "y",
  unit: "µm",
};

const num = (v: number): string => String(Number(v.toPrecision(12)));

function build(input: Partial<PlMapOptions>): TopLevelSpec {
  const o = { ...PL_MAP_DEFAULTS, ...input };
  const p = withPrint(o.print);
  const half = num(o.pixelUm / 2);
  const xTitle = axisTitle(o.xName, o.unit);
  const yTitle = axisTitle(o.yName, o.unit);
  const scale = { zero: false, nice: false };
  const pos = (field: string, title: string): Spec => quantitative(field, title, scale);
  const heightPt = mmToPt(p.heightMm);
  const layers: Spec[] = [
    {
      transform: [
        { calculate: `${datumRef(o.xField)} - ${half}`, as: "map_x0" },
        { calculate: `${datumRef(o.xField)} + ${half}`, as: "map_x1" },
        { calculate: `${datumRef(o.yField)} - ${half}`, as: "map_y0" },
        { calculate: `${datumRef(o.yField)} + ${half}`, as: "map_y1" },
      ],
      // Each pixel reaches 0.6 pt under its right and upper neighbours (drawn later): no anti-aliasing seams.
      mark: { type: "rect", strokeWidth: 0, x2Offset: 0.6, y2Offset: -0.6 },
      encoding: {
        x: pos("map_x0", xTitle),
        x2: { field: "map_x1" },
        y: pos("map_y0", yTitle),
        y2: { field: "map_y1" },
        color: {
          field: vlField(o.valueField),
          type: "quantitative",
          scale: { scheme: o.colorScheme },
          legend: {
            title: o.colorTitle,
            orient: "right",
            direction: "vertical",
            gradientLength: Math.round(heightPt * 0.6),
            titleOrient: "right",
            titleAnchor: "middle",
            tickCount: 4,
          },
        },
      },
    },
  ];
  if (o.scaleBarUm > 0) {
    const L = num(o.scaleBarUm);
    layers.push({
      transform: [
        {
          aggregate: [
            { op: "min", field: vlField(o.xField), as: "bar_xmin" },
            { op: "max", field: vlField(o.xField), as: "bar_xmax" },
            { op: "min", field: vlField(o.yField), as: "bar_ymin" },
            { op: "max", field: vlField(o.yField), as: "bar_ymax" },
          ],
        },
        { calculate: `datum.bar_xmax + ${half} - 0.06 * (datum.bar_xmax - datum.bar_xmin) - ${L}`, as: "bar_x0" },
        { calculate: `datum.bar_x0 + ${L}`, as: "bar_x1" },
        { calculate: `datum.bar_x0 + ${L} / 2`, as: "bar_xc" },
        { calculate: `datum.bar_ymin - ${half} + 0.08 * (datum.bar_ymax - datum.bar_ymin)`, as: "bar_y" },
      ],
      layer: [
        {
          mark: { type: "rule", color: "white", strokeWidth: 2, strokeCap: "butt" },
          encoding: { x: pos("bar_x0", xTitle), x2: { field: "bar_x1" }, y: pos("bar_y", yTitle) },
        },
        {
          mark: { type: "text", color: "white", baseline: "bottom", align: "center", dy: -3 },
          encoding: { x: pos("bar_xc", xTitle), y: pos("bar_y", yTitle), text: { value: `${L} ${o.unit}` } },
        },
      ],
    });
  }
  return singleViewPanel(p, `PL map of ${o.valueField}`, { data: { name: o.dataName } }, layers);
}

export const plMapTemplate: FigureTemplate<PlMapOptions> = {
  id: "pl-map",
  title: "PL map (heatmap) with colour and scale bars",
  description: "2-D confocal scan as a heatmap in counts/s with a colour bar and a scale bar in µm.",
  options: [
    ...dataOptions("Scan", "plmap", [
      ["xField", "x column", "x"],
      ["yField", "y column", "y"],
      ["valueField", "Count-rate column", "counts"],
    ]),
    { key: "pixelUm", label: "Scan step", kind: "number", default: 0.2, min: 0, unit: "µm" },
    { key: "scaleBarUm", label: "Scale bar", kind: "number", default: 5, min: 0, unit: "µm", help: "0 for none" },
    {
      key: "colorScheme",
      label: "Colour map",
      kind: "select",
      default: "viridis",
      choices: [
        { value: "viridis", label: "viridis" },
        { value: "cividis", label: "cividis" },
        { value: "magma", label: "magma" },
        { value: "greys", label: "greys" },
      ],
    },
    { key: "colorTitle", label: "Colour bar title", kind: "text", default: "count rate (kcounts/s)" },
    { key: "xName", label: "x axis name", kind: "text", default: "x" },
    { key: "yName", label: "y axis name", kind: "text", default: "y" },
    { key: "unit", label: "Position unit", kind: "text", default: "µm" },
  ],
  dataNames: dataNamesOf(PL_MAP_DEFAULTS, ["dataName"]),
  build,
};
