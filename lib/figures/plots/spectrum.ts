/**
 * Spectra with labelled vertical marker lines: PL spectra with the zero-phonon lines, ODMR with
 * its resonances, and NV-NMR spectra with the expected nuclear Larmor line at the current field.
 */
import { NUCLEI, type Nucleus } from "@/lib/physics/constants";
import { decouplingDipSpacing, larmorFrequency } from "@/lib/physics/larmor";
import { axisTitle, OKABE_ITO, quantitative, type ScaleKind, scaleFor, seriesFilter, singleViewPanel, type Spec, vlField, withPrint } from "./print";
import { NV_ZPL_MARKERS } from "./data-defaults";
import { axisTextOptions, dataNamesOf, dataOptions, fittedCurveOption, scaleOption } from "./template-options";
import type { CommonOptions, FigureTemplate, Marker, XYAxisText } from "./types";

export interface SpectrumOptions extends CommonOptions, XYAxisText {
  dataName: string;
  xField: string;
  yField: string;
  fitName?: string;
  fitXField?: string;
  fitYField?: string;
  seriesField?: string;
  yScale: ScaleKind;
  markers: Marker[];
}

/** NV⁰ and NV⁻ zero-phonon lines, nm (sources beside NV_ZPL_MARKERS). */
const ZPL_MARKERS: Marker[] = NV_ZPL_MARKERS;

const SPECTRUM_DEFAULTS: SpectrumOptions = {
  dataName: "spectrum",
  xField: "wavelength",
  yField: "intensity",
  fitName: "",
  seriesField: "series",
  xName: "wavelength",
  xUnit: "nm",
  yName: "PL intensity",
  yUnit: "kcounts/s",
  yScale: "linear",
  markers: ZPL_MARKERS,
};

/** The line-plus-markers layers shared by the spectrum and NV-NMR templates. */
function spectrumLayers(o: SpectrumOptions, markerColor: string): Spec[] {
  const series = o.seriesField || "series";
  const xTitle = axisTitle(o.xName, o.xUnit);
  const x = (field: string): Spec => quantitative(field, xTitle, { zero: false, nice: false });
  const y = quantitative(o.yField, axisTitle(o.yName, o.yUnit), scaleFor(o.yScale));
  const layers: Spec[] = [{ data: { name: o.dataName }, mark: { type: "line", color: OKABE_ITO.black, strokeWidth: 0.8 }, encoding: { x: x(o.xField), y } }];
  if (o.fitName) {
    layers.push({
      data: { name: o.fitName },
      transform: [{ filter: seriesFilter(series, "curve") }],
      mark: { type: "line", color: OKABE_ITO.vermillion, strokeWidth: 1 },
      encoding: { x: x(o.fitXField || o.xField), y: { ...y, field: vlField(o.fitYField || o.yField) } },
    });
  }
  if (o.markers.length) {
    const markerX = { ...x("position") };
    layers.push({
      data: { values: o.markers.map((m) => ({ position: m.position, label: m.label })) },
      layer: [
        { mark: { type: "rule", color: markerColor, strokeDash: [3, 2] }, encoding: { x: markerX } },
        {
          mark: { type: "text", color: markerColor, align: "left", baseline: "top", dx: 2, dy: 2 },
          encoding: { x: markerX, y: { value: 0 }, text: { field: "label", type: "nominal" } },
        },
      ],
    });
  }
  return layers;
}

export const spectrumTemplate: FigureTemplate<SpectrumOptions> = {
  id: "spectrum",
  title: "Spectrum with marker lines",
  description: "PL or ODMR spectrum with labelled vertical lines (zero-phonon lines, resonances) and an optional fitted curve.",
  options: [
    ...dataOptions("Spectrum", "spectrum", [
      ["xField", "x column", "wavelength"],
      ["yField", "y column", "intensity"],
    ]),
    fittedCurveOption(),
    ...axisTextOptions("x", ["xName", "wavelength"], ["xUnit", "nm"]),
    ...axisTextOptions("y", ["yName", "PL intensity"], ["yUnit", "kcounts/s"]),
    scaleOption("yScale", "y axis"),
    { key: "markers", label: "Marker lines", kind: "markers", default: ZPL_MARKERS, help: "position in the x unit and a label" },
  ],
  dataNames: dataNamesOf(SPECTRUM_DEFAULTS, ["dataName", "fitName"]),
  build(input) {
    const o = { ...SPECTRUM_DEFAULTS, ...input };
    return singleViewPanel(withPrint(o.print), `Spectrum of ${o.yName} against ${o.xName}`, {}, spectrumLayers(o, OKABE_ITO.blue));
  },
};

export interface NvNmrOptions extends Omit<SpectrumOptions, "markers" | "xName" | "xUnit"> {
  /** x axis name; default "frequency" or "τ" by `xQuantity` (the unit follows `xQuantity`). */
  xName?: string;
  nucleus: Nucleus;
  /** Bias field along the NV axis, mT. */
  fieldMt: number;
  /** Frequency axis (MHz) or pulse spacing τ (µs), where the dip sits at τ = 1/(2f). */
  xQuantity: "frequency" | "spacing";
}

const NV_NMR_DEFAULTS: NvNmrOptions = {
  dataName: "nmr",
  xField: "frequency",
  yField: "contrast",
  fitName: "",
  seriesField: "series",
  yName: "contrast",
  yUnit: "",
  yScale: "linear",
  nucleus: "1H",
  fieldMt: 50,
  xQuantity: "frequency",
};

/** Where the expected line goes: MHz on a frequency axis, µs on a pulse-spacing axis. */
export function expectedNucleusMarker(nucleus: Nucleus, fieldMt: number, xQuantity: "frequency" | "spacing"): Marker {
  const fHz = larmorFrequency(nucleus, fieldMt * 1e-3);
  const label = `${NUCLEI[nucleus].label} at ${fieldMt} mT`;
  if (xQuantity === "spacing") return { position: Number((decouplingDipSpacing(fHz) * 1e6).toPrecision(6)), label };
  return { position: Number((fHz / 1e6).toPrecision(6)), label };
}

export const nvNmrTemplate: FigureTemplate<NvNmrOptions> = {
  id: "nv-nmr",
  title: "NV-NMR spectrum with expected nucleus",
  description: "Dynamical-decoupling or spin-lock NMR spectrum with a line at the expected Larmor frequency of the chosen nucleus at the current field.",
  options: [
    ...dataOptions("Spectrum", "nmr", [
      ["xField", "Frequency or τ column", "frequency"],
      ["yField", "Signal column", "contrast"],
    ]),
    fittedCurveOption(),
    {
      key: "xQuantity",
      label: "x axis",
      kind: "select",
      default: "frequency",
      choices: [
        { value: "frequency", label: "frequency (MHz)" },
        { value: "spacing", label: "pulse spacing τ (µs)" },
      ],
    },
    {
      key: "nucleus",
      label: "Nucleus",
      kind: "select",
      default: "1H",
      choices: (["1H", "13C", "19F", "14N", "15N"] as Nucleus[]).map((n) => ({ value: n, label: NUCLEI[n].label })),
    },
    { key: "fieldMt", label: "Bias field", kind: "number", default: 50, min: 0, unit: "mT" },
    { key: "xName", label: "x axis name", kind: "text", help: "default: frequency, or τ for pulse spacing" },
    ...axisTextOptions("Signal", ["yName", "contrast"], ["yUnit", ""]),
  ],
  dataNames: dataNamesOf(NV_NMR_DEFAULTS, ["dataName", "fitName"]),
  build(input) {
    const o = { ...NV_NMR_DEFAULTS, ...input };
    const marker = expectedNucleusMarker(o.nucleus, o.fieldMt, o.xQuantity);
    const spacing = o.xQuantity === "spacing";
    const spectrum: SpectrumOptions = { ...o, xName: o.xName || (spacing ? "τ" : "frequency"), xUnit: spacing ? "µs" : "MHz", markers: [marker] };
    const description = `NV-NMR spectrum with the ${NUCLEI[o.nucleus].label} line at ${o.fieldMt} mT`;
    return singleViewPanel(withPrint(o.print), description, {}, spectrumLayers(spectrum, OKABE_ITO.vermillion));
  },
};
