/**
 * Spectra with labelled vertical marker lines: PL spectra with the zero-phonon lines, ODMR with
 * its resonances, and NV-NMR spectra with the expected nuclear Larmor line at the current field.
 */
import type { TopLevelSpec } from "vega-lite";
import { NUCLEI, type Nucleus } from "@/lib/physics/constants";
import { decouplingDipSpacing, larmorFrequency } from "@/lib/physics/larmor";
import { axisTitle, OKABE_ITO, SCALE_CHOICES, type ScaleKind, scaleFor, seriesFilter, singleViewFrame, type Spec, vlField, withPrint } from "./print";
import type { CommonOptions, FigureTemplate, Marker } from "./types";

export interface SpectrumOptions extends CommonOptions {
  dataName: string;
  xField: string;
  yField: string;
  fitName?: string;
  fitXField?: string;
  fitYField?: string;
  seriesField?: string;
  xName: string;
  xUnit: string;
  yName: string;
  yUnit: string;
  yScale: ScaleKind;
  markers: Marker[];
}

/** NV⁰ and NV⁻ zero-phonon lines, nm. */
export const ZPL_MARKERS: Marker[] = [
  { position: 575.1, label: "NV⁰ ZPL" },
  { position: 637.4, label: "NV⁻ ZPL" },
];

export const SPECTRUM_DEFAULTS: SpectrumOptions = {
  dataName: "spectrum", xField: "wavelength", yField: "intensity", fitName: "", seriesField: "series",
  xName: "wavelength", xUnit: "nm", yName: "PL intensity", yUnit: "kcounts/s", yScale: "linear", markers: ZPL_MARKERS,
};

/** The line-plus-markers layers shared by the spectrum and NV-NMR templates. */
export function spectrumLayers(o: SpectrumOptions, markerColor: string): Spec[] {
  const series = o.seriesField || "series";
  const xTitle = axisTitle(o.xName, o.xUnit);
  const x = (field: string): Spec => ({ field: vlField(field), type: "quantitative", title: xTitle, scale: { zero: false, nice: false } });
  const y: Spec = { field: vlField(o.yField), type: "quantitative", title: axisTitle(o.yName, o.yUnit), scale: scaleFor(o.yScale) };
  const layers: Spec[] = [
    { data: { name: o.dataName }, mark: { type: "line", color: OKABE_ITO.black, strokeWidth: 0.8 }, encoding: { x: x(o.xField), y } },
  ];
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
    { key: "dataName", label: "Spectrum", kind: "data-name", binds: "dataset", required: true, default: "spectrum" },
    { key: "xField", label: "x column", kind: "column", dataKey: "dataName", required: true, default: "wavelength" },
    { key: "yField", label: "y column", kind: "column", dataKey: "dataName", required: true, default: "intensity" },
    { key: "fitName", label: "Fitted curve", kind: "data-name", binds: "analysis-curve", help: "leave empty for no fit" },
    { key: "xName", label: "x axis name", kind: "text", default: "wavelength" },
    { key: "xUnit", label: "x unit", kind: "text", default: "nm" },
    { key: "yName", label: "y axis name", kind: "text", default: "PL intensity" },
    { key: "yUnit", label: "y unit", kind: "text", default: "kcounts/s" },
    { key: "yScale", label: "y axis", kind: "select", choices: SCALE_CHOICES, default: "linear" },
    { key: "markers", label: "Marker lines", kind: "markers", default: ZPL_MARKERS, help: "position in the x unit and a label" },
  ],
  dataNames: (input) => {
    const o = { ...SPECTRUM_DEFAULTS, ...input };
    return [o.dataName, ...(o.fitName ? [o.fitName] : [])];
  },
  build(input) {
    const o = { ...SPECTRUM_DEFAULTS, ...input };
    const frame = singleViewFrame(withPrint(o.print), `Spectrum of ${o.yName} against ${o.xName}`);
    return { ...frame, layer: spectrumLayers(o, OKABE_ITO.blue) } as unknown as TopLevelSpec;
  },
};

export interface NvNmrOptions extends Omit<SpectrumOptions, "markers" | "xName" | "xUnit"> {
  nucleus: Nucleus;
  /** Bias field along the NV axis, mT. */
  fieldMt: number;
  /** Frequency axis (MHz) or pulse spacing τ (µs), where the dip sits at τ = 1/(2f). */
  xQuantity: "frequency" | "spacing";
}

export const NV_NMR_DEFAULTS: NvNmrOptions = {
  dataName: "nmr", xField: "frequency", yField: "contrast", fitName: "", seriesField: "series", yName: "contrast",
  yUnit: "", yScale: "linear", nucleus: "1H", fieldMt: 50, xQuantity: "frequency",
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
    { key: "dataName", label: "Spectrum", kind: "data-name", binds: "dataset", required: true, default: "nmr" },
    { key: "xField", label: "Frequency or τ column", kind: "column", dataKey: "dataName", required: true, default: "frequency" },
    { key: "yField", label: "Signal column", kind: "column", dataKey: "dataName", required: true, default: "contrast" },
    { key: "fitName", label: "Fitted curve", kind: "data-name", binds: "analysis-curve", help: "leave empty for no fit" },
    { key: "xQuantity", label: "x axis", kind: "select", default: "frequency", choices: [
      { value: "frequency", label: "frequency (MHz)" }, { value: "spacing", label: "pulse spacing τ (µs)" }] },
    { key: "nucleus", label: "Nucleus", kind: "select", default: "1H",
      choices: (["1H", "13C", "19F", "14N", "15N"] as Nucleus[]).map((n) => ({ value: n, label: NUCLEI[n].label })) },
    { key: "fieldMt", label: "Bias field", kind: "number", default: 50, min: 0, unit: "mT" },
    { key: "yName", label: "Signal axis name", kind: "text", default: "contrast" },
    { key: "yUnit", label: "Signal unit", kind: "text", default: "" },
  ],
  dataNames: (input) => {
    const o = { ...NV_NMR_DEFAULTS, ...input };
    return [o.dataName, ...(o.fitName ? [o.fitName] : [])];
  },
  build(input) {
    const o = { ...NV_NMR_DEFAULTS, ...input };
    const marker = expectedNucleusMarker(o.nucleus, o.fieldMt, o.xQuantity);
    const spacing = o.xQuantity === "spacing";
    const spectrum: SpectrumOptions = { ...o, xName: spacing ? "τ" : "frequency", xUnit: spacing ? "µs" : "MHz", markers: [marker] };
    const frame = singleViewFrame(withPrint(o.print), `NV-NMR spectrum with the ${NUCLEI[o.nucleus].label} line at ${o.fieldMt} mT`);
    return { ...frame, layer: spectrumLayers(spectrum, OKABE_ITO.vermillion) } as unknown as TopLevelSpec;
  },
};
