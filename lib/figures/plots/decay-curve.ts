/**
 * Decay curve (Hahn echo, T1, Ramsey envelope): measured points with optional ±σ error bars, the
 * fitted curve from an analysis output, and a residual strip below sharing the time axis.
 */
import type { TopLevelSpec } from "vega-lite";
import {
  axisTitle,
  concatFrame,
  innerWidthPt,
  mmToPt,
  OKABE_ITO,
  type ScaleKind,
  scaleFor,
  seriesFilter,
  quantitative,
  singleViewPanel,
  type Spec,
  vlField,
  withPrint,
} from "./print";
import { axisTextOptions, dataNamesOf, dataOptions, fittedCurveOption, scaleOption, SIGMA_COLUMN_OPTION } from "./template-options";
import type { CommonOptions, FigureTemplate, XYAxisText } from "./types";

export interface DecayCurveOptions extends CommonOptions, XYAxisText {
  dataName: string;
  xField: string;
  yField: string;
  /** Column of 1σ uncertainties of y; empty for none. */
  sigmaField?: string;
  /** Analysis output (curve rows) to draw as the fitted line; empty for none. */
  fitName?: string;
  /** Analysis output (residual rows) for the strip; empty for none. */
  residualName?: string;
  /** Column names in the analysis output (default: the same as the data's). */
  fitXField?: string;
  fitYField?: string;
  seriesField?: string;
  xScale: ScaleKind;
  /** Title of the residual strip's y axis. */
  residualTitle?: string;
}

export const DECAY_CURVE_DEFAULTS: DecayCurveOptions = {
  dataName: "echo",
  xField: "tau",
  yField: "signal",
  sigmaField: "",
  fitName: "fit",
  residualName: "residuals",
  seriesField: "series",
  xName: "τ",
  xUnit: "µs",
  yName: "coherence",
  yUnit: "",
  xScale: "linear",
  residualTitle: "residual",
};

function build(input: Partial<DecayCurveOptions>): TopLevelSpec {
  const o = { ...DECAY_CURVE_DEFAULTS, ...input };
  const p = withPrint(o.print);
  const fitX = o.fitXField || o.xField;
  const fitY = o.fitYField || o.yField;
  const series = o.seriesField || "series";
  const xTitle = axisTitle(o.xName, o.xUnit);
  const yTitle = axisTitle(o.yName, o.yUnit);
  const withStrip = !!o.residualName;
  const x = (field: string, showAxis: boolean): Spec => ({
    ...quantitative(field, xTitle, scaleFor(o.xScale, { nice: false })),
    ...(showAxis ? {} : { axis: { labels: false, title: null } }),
  });
  const y = quantitative(o.yField, yTitle, { zero: false });

  const layers: Spec[] = [];
  if (o.sigmaField) {
    layers.push({
      data: { name: o.dataName },
      mark: { type: "errorbar", color: OKABE_ITO.blue, thickness: 0.6 },
      encoding: { x: x(o.xField, !withStrip), y, yError: { field: vlField(o.sigmaField) } },
    });
  }
  layers.push({
    data: { name: o.dataName },
    mark: { type: "point", color: OKABE_ITO.blue },
    encoding: { x: x(o.xField, !withStrip), y },
  });
  if (o.fitName) {
    layers.push({
      data: { name: o.fitName },
      transform: [{ filter: seriesFilter(series, "curve") }],
      mark: { type: "line", color: OKABE_ITO.vermillion, strokeWidth: 1 },
      encoding: { x: x(fitX, !withStrip), y: { ...y, field: vlField(fitY) } },
    });
  }
  const description = `Decay curve of ${o.yName} against ${o.xName}`;
  if (!withStrip) return singleViewPanel(p, description, {}, layers);

  const inner = innerWidthPt(p);
  const total = mmToPt(p.heightMm);
  const residuals: Spec = {
    width: inner,
    height: Math.round(total * 0.2),
    data: { name: o.residualName },
    transform: [{ filter: seriesFilter(series, "residual") }],
    layer: [
      { mark: { type: "rule", color: "#777777", strokeDash: [2, 2] }, encoding: { y: { datum: 0, type: "quantitative" } } },
      {
        mark: { type: "point", color: OKABE_ITO.blue },
        encoding: {
          x: x(fitX, true),
          y: { field: vlField(fitY), type: "quantitative", title: o.residualTitle, axis: { tickCount: 3 } },
        },
      },
    ],
  };
  return {
    ...concatFrame(p, description),
    vconcat: [{ width: inner, height: Math.round(total * 0.62), layer: layers }, residuals],
    resolve: { scale: { x: "shared" } },
  } as unknown as TopLevelSpec;
}

export const decayCurveTemplate: FigureTemplate<DecayCurveOptions> = {
  id: "decay-curve",
  title: "Decay curve with fit and residuals",
  description: "Hahn-echo, T1 or Ramsey decay: points (± σ), fitted curve and a residual strip on a linear or log time axis.",
  options: [
    ...dataOptions("Measured points", "echo", [
      ["xField", "Time column", "tau"],
      ["yField", "Signal column", "signal"],
    ]),
    SIGMA_COLUMN_OPTION,
    fittedCurveOption("fit"),
    {
      key: "residualName",
      label: "Residuals",
      kind: "data-name",
      binds: "analysis-residuals",
      default: "residuals",
      help: "leave empty for no residual strip",
    },
    { key: "fitXField", label: "Time column of the fit", kind: "column", dataKey: "fitName", help: "default: as the data" },
    { key: "fitYField", label: "Value column of the fit", kind: "column", dataKey: "fitName", help: "default: as the data" },
    ...axisTextOptions("Time", ["xName", "τ"], ["xUnit", "µs"]),
    ...axisTextOptions("Signal", ["yName", "coherence"], ["yUnit", ""]),
    scaleOption("xScale", "Time axis"),
    { key: "residualTitle", label: "Residual axis name", kind: "text", default: "residual" },
  ],
  dataNames: dataNamesOf(DECAY_CURVE_DEFAULTS, ["dataName", "fitName", "residualName"]),
  build,
};
