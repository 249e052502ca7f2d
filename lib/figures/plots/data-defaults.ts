/**
 * Template options that follow the data: which template suits a kind of measurement, which columns
 * go on x and y (never the same one), axis names by kind and units from the columns, log time
 * axes for decays, and marker lines from what is known of the sample — the resonances of the
 * stored ODMR fit, the NV zero-phonon lines on a PL spectrum.
 */
import { toSIFactor } from "@/lib/data/units";
import type { FigureTemplate, Marker } from "./types";

interface ColumnFacts {
  name: string;
  unit: string | null;
  type: string;
}

/** A stored fit of the data: its model id and fitted parameters (value in `unit`). */
export interface FitFacts {
  model: string;
  parameters: Array<{ name: string; value: number | null; unit?: string | null }>;
}

/** What the builder knows of the measured data it is given. */
export interface DataFacts {
  /** The dataset's kind: odmr, pl_spectrum, hahn_echo, relaxation, ramsey, nv_nmr, pl_map, other. */
  kind: string;
  columns: ColumnFacts[];
  fit?: FitFacts | null;
}

/**
 * NV⁰ and NV⁻ zero-phonon lines, nm, as published: 575 nm (2.156 eV) and 637 nm (1.945 eV).
 * Doherty et al., "The nitrogen-vacancy colour centre in diamond", Phys. Rep. 528, 1 (2013),
 * doi:10.1016/j.physrep.2013.02.001; Manson et al., Phys. Rev. B 87, 155209 (2013),
 * arXiv:1301.3542, whose abstract gives "637 nm (1.945 eV)" for NV⁻ and "575 nm (2.156 eV)" for
 * NV⁰. (hc/E gives 575.07 and 637.45 nm; a marker line is not a fit, the published round values are drawn.)
 */
export const NV_ZPL_MARKERS: Marker[] = [
  { position: 575, label: "NV⁰ ZPL" },
  { position: 637, label: "NV⁻ ZPL" },
];

const TEMPLATE_FOR_KIND: Record<string, string> = {
  odmr: "spectrum",
  pl_spectrum: "spectrum",
  hahn_echo: "decay-curve",
  decoupling: "decay-curve",
  relaxation: "decay-curve",
  ramsey: "decay-curve",
  nv_nmr: "nv-nmr",
  pl_map: "pl-map",
};

/** The template that suits a kind of measurement (the generic scatter plot when none does). */
export function templateForKind(kind: string): string {
  return TEMPLATE_FOR_KIND[kind] ?? "scatter-line";
}

type Quantity = "frequency" | "wavelength" | "time" | "position";

/** Axis names by kind: what the x column measures and how the axes are titled. */
const AXES: Record<string, { x: Quantity; xName: string; yName: string; logX?: boolean }> = {
  odmr: { x: "frequency", xName: "Microwave frequency", yName: "PL" },
  pl_spectrum: { x: "wavelength", xName: "Wavelength", yName: "PL intensity" },
  hahn_echo: { x: "time", xName: "Free evolution time τ", yName: "Echo signal", logX: true },
  decoupling: { x: "time", xName: "Total free evolution time τ", yName: "Echo signal", logX: true },
  relaxation: { x: "time", xName: "Dark time τ", yName: "PL", logX: true },
  ramsey: { x: "time", xName: "Free precession time τ", yName: "PL" },
  nv_nmr: { x: "frequency", xName: "Frequency", yName: "Contrast" },
  pl_map: { x: "position", xName: "x", yName: "y" },
};

const SI_OF: Record<Quantity, string> = { frequency: "Hz", wavelength: "m", time: "s", position: "m" };
const NAME_OF: Record<Quantity, RegExp> = {
  frequency: /^(f|freq|frequency|mw|mw[ _]?freq\w*)$/i,
  wavelength: /^(wavelength|lambda|λ|wl)$/i,
  time: /^(t|tau|τ|time|wait|delay|dt|t_?wait)$/i,
  position: /^x$/i,
};
const SIGMA = /^(sigma|σ|err|error|stderr|uncertainty|sd|std)$/i;

const isQuantity = (c: ColumnFacts, q: Quantity) => (c.unit ? toSIFactor(c.unit)?.siUnit === SI_OF[q] : false) || NAME_OF[q].test(c.name);

/** x, y and σ columns: x by what the kind measures on x, y the first other number column, σ by name. */
function pickColumns(facts: DataFacts, q: Quantity | undefined): { x?: ColumnFacts; y?: ColumnFacts; sigma?: ColumnFacts; rest: ColumnFacts[] } {
  const numeric = facts.columns.filter((c) => c.type === "number");
  const sigma = numeric.find((c) => SIGMA.test(c.name));
  const candidates = numeric.filter((c) => c !== sigma);
  const x = (q && candidates.find((c) => isQuantity(c, q))) || candidates[0];
  const others = candidates.filter((c) => c !== x);
  return { x, y: others[0], sigma, rest: others.slice(1) };
}

/** A value in `from` written in `to` (MHz ↔ GHz, nm ↔ µm); unchanged when either is unknown or they differ in kind. */
function convert(value: number, from: string | null | undefined, to: string | null | undefined): number {
  if (!from || !to || from === to) return value;
  const a = toSIFactor(from);
  const b = toSIFactor(to);
  if (!a || !b || a.siUnit !== b.siUnit) return value;
  return Number(((value * a.factor) / b.factor).toPrecision(10));
}

const SUBSCRIPT_DIGITS = "₀₁₂₃₄₅₆₇₈₉";
const subscript = (n: number) => [...String(n)].map((d) => SUBSCRIPT_DIGITS[Number(d)]).join("");

/** The resonances a stored ODMR fit found, in the x unit: f₋ and f₊, f₀ of a hyperfine group, or f₁ … fₙ. */
export function odmrMarkers(fit: FitFacts | null | undefined, xUnit: string | null): Marker[] {
  if (!fit) return [];
  const value = (name: string) => {
    const p = fit.parameters.find((q) => q.name === name);
    return p && typeof p.value === "number" && Number.isFinite(p.value) ? convert(p.value, p.unit ?? xUnit, xUnit) : null;
  };
  const marker = (position: number | null, label: string): Marker[] => (position === null ? [] : [{ position: Number(position.toPrecision(7)), label }]);
  if (fit.parameters.some((p) => p.name === "fMinus")) return [...marker(value("fMinus"), "f₋"), ...marker(value("fPlus"), "f₊")];
  if (fit.parameters.some((p) => p.name === "f0")) return marker(value("f0"), "f₀");
  const centres = fit.parameters
    .filter((p) => /^f\d+$/.test(p.name))
    .map((p) => value(p.name))
    .filter((v): v is number => v !== null)
    .sort((a, b) => a - b);
  if (centres.length === 2) return [...marker(centres[0], "f₋"), ...marker(centres[1], "f₊")];
  return centres.flatMap((c, i) => marker(c, `f${subscript(i + 1)}`));
}

/** The zero-phonon lines in the x unit when x is a wavelength; none otherwise. */
function zplMarkers(xUnit: string | null): Marker[] {
  if (!xUnit || toSIFactor(xUnit)?.siUnit !== "m") return [];
  return NV_ZPL_MARKERS.map((m) => ({ ...m, position: convert(m.position, "nm", xUnit) }));
}

/** Every option key `dataDefaults` may set: what a builder lets go of when other data are chosen. */
export const DATA_DEFAULT_KEYS: ReadonlySet<string> = new Set([
  "xField",
  "yField",
  "sigmaField",
  "xName",
  "xUnit",
  "yName",
  "yUnit",
  "xScale",
  "markers",
  "xQuantity",
  "valueField",
  "unit",
  "colorTitle",
  "groupField",
  "groupName",
  "valueName",
]);

/**
 * Options of `template` that follow the data (only keys the template has): columns, axis names
 * and units, scales, markers. The builder uses them where the person has not chosen otherwise.
 */
export function dataDefaults(template: FigureTemplate<any>, facts: DataFacts): Record<string, unknown> {
  const axes = AXES[facts.kind];
  const { x, y, sigma, rest } = pickColumns(facts, axes?.x);
  const unit = (c: ColumnFacts | undefined) => c?.unit ?? "";
  const xName = axes?.xName ?? x?.name ?? "x";
  const yName = axes?.yName ?? y?.name ?? "y";
  const out: Record<string, unknown> = {
    xField: x?.name,
    yField: y?.name,
    sigmaField: sigma?.name ?? "",
    xName,
    xUnit: unit(x),
    yName,
    yUnit: unit(y),
  };
  if (axes?.logX) out.xScale = "log";
  if (facts.kind === "odmr") out.markers = odmrMarkers(facts.fit, x?.unit ?? null);
  else if (facts.kind === "pl_spectrum") out.markers = zplMarkers(x?.unit ?? null);
  else out.markers = [];
  if (template.id === "nv-nmr") {
    const spacing = x ? isQuantity(x, "time") : false;
    out.xQuantity = spacing ? "spacing" : "frequency";
    out.xName = spacing ? "Pulse spacing τ" : xName;
  }
  if (template.id === "pl-map") {
    out.valueField = y && rest.length ? rest[0].name : y?.name;
    out.yField = y && rest.length ? y.name : undefined;
    out.unit = unit(x) || "µm";
    const value = facts.columns.find((c) => c.name === out.valueField);
    out.colorTitle = value ? (value.unit ? `PL (${value.unit})` : "PL") : undefined;
  }
  if (template.id === "group-strip") {
    const group = facts.columns.find((c) => c.type === "string");
    const value = facts.columns.find((c) => c.type === "number");
    Object.assign(out, { groupField: group?.name, groupName: group?.name, valueField: value?.name, valueName: value?.name, unit: unit(value) });
  }
  const keys = new Set(template.options.map((o) => o.key));
  return Object.fromEntries(Object.entries(out).filter(([k, v]) => keys.has(k) && DATA_DEFAULT_KEYS.has(k) && v !== undefined));
}
