/**
 * T₂ versus the number of π pulses N (CPMG, XY-N) on log–log axes: one point per run with ± σ error
 * bars, and the fitted power law T₂(N) = T₂(1)·N^s as a line. On log–log axes a power law is straight,
 * so the line drawn through the fitted values at the measured N is the fit itself (no sampling).
 * T₂(1) and s are typed from the Analyses page's decoupling-scaling result (T₂(1) in the T₂ column's unit).
 */
import type { TopLevelSpec } from "vega-lite";
import { axisTitle, OKABE_ITO, quantitative, singleViewPanel, type Spec, vlField, withPrint } from "./print";
import { axisTextOptions, dataNamesOf, dataOptions } from "./template-options";
import type { CommonOptions, FigureTemplate, XYAxisText } from "./types";

interface PulseScalingOptions extends CommonOptions, XYAxisText {
  dataName: string;
  xField: string;
  yField: string;
  sigmaField?: string;
  /** Fitted T₂(1) in the T₂ column's unit; 0 for no line. */
  fitT2One: number;
  /** Fitted exponent s. */
  fitExponent: number;
}

const PULSE_SCALING_DEFAULTS: PulseScalingOptions = {
  dataName: "scaling",
  xField: "N",
  yField: "T2",
  sigmaField: "T2_err",
  fitT2One: 0,
  fitExponent: 0,
  xName: "number of π pulses N",
  xUnit: "",
  yName: "T₂",
  yUnit: "µs",
};

/** The name under which the line's values are computed; not a column of the data. */
const FITTED = "pulse_scaling_fit";

function build(input: Partial<PulseScalingOptions>): TopLevelSpec {
  const o = { ...PULSE_SCALING_DEFAULTS, ...input };
  const log = { type: "log" };
  const x = quantitative(o.xField, axisTitle(o.xName, o.xUnit), log);
  const y = quantitative(o.yField, axisTitle(o.yName, o.yUnit), log);
  const layers: Spec[] = [];
  if (o.sigmaField)
    layers.push({ mark: { type: "errorbar", thickness: 0.6, color: OKABE_ITO.blue }, encoding: { x, y, yError: { field: vlField(o.sigmaField) } } });
  layers.push({ mark: { type: "point", color: OKABE_ITO.blue, filled: true }, encoding: { x, y } });
  const t2One = Number(o.fitT2One);
  const s = Number(o.fitExponent);
  if (Number.isFinite(t2One) && t2One > 0 && Number.isFinite(s)) {
    layers.push({
      transform: [{ calculate: `${t2One} * pow(datum[${JSON.stringify(o.xField)}], ${s})`, as: FITTED }],
      mark: { type: "line", color: OKABE_ITO.vermillion, strokeWidth: 1 },
      encoding: { x, y: { ...y, field: FITTED } },
    });
  }
  return singleViewPanel(withPrint(o.print), `${o.yName} against ${o.xName} on log–log axes`, { data: { name: o.dataName } }, layers);
}

export const pulseScalingTemplate: FigureTemplate<PulseScalingOptions> = {
  id: "pulse-scaling",
  title: "T₂ versus pulse number",
  description: "Decoupling scaling: T₂ (± σ) against the number of π pulses on log–log axes, with the fitted T₂(1)·N^s as a line.",
  options: [
    ...dataOptions("Runs (one row per N)", "scaling", [
      ["xField", "Pulse number column", "N"],
      ["yField", "T₂ column", "T2"],
    ]),
    { key: "sigmaField", label: "σ column (error bars)", kind: "column", dataKey: "dataName", default: "T2_err" },
    { key: "fitT2One", label: "Fitted T₂(1)", kind: "number", default: 0, min: 0, help: "from Decoupling scaling on the Analyses page; 0 for no line" },
    { key: "fitExponent", label: "Fitted exponent s", kind: "number", default: 0, min: -10, max: 10 },
    ...axisTextOptions("Pulse number", ["xName", "number of π pulses N"], ["xUnit", ""]),
    ...axisTextOptions("T₂", ["yName", "T₂"], ["yUnit", "µs"]),
  ],
  dataNames: dataNamesOf(PULSE_SCALING_DEFAULTS, ["dataName"]),
  build,
};
