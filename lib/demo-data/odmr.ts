/**
 * CW ODMR spectra: Lorentzian dips of normalised PL at f± = D ± γ_NV·B (field along the NV
 * axis, lib/physics/odmr), each split into a ¹⁴N triplet spaced |A∥| when the lines are narrow.
 */
import type { DemoFile } from "./types";
import { Rng } from "./prng";
import { fixed, linSpace, lorentz } from "./numeric";
import { CONFOCAL, SAMPLE, type SampleGroup, commentHeader, measuredAt, standardHeader } from "./scenario";
import { NV_GAMMA, NV_ZERO_FIELD_SPLITTING } from "@/lib/physics/constants";
import { odmrResonances } from "@/lib/physics/odmr";

/**
 * ¹⁴N |A∥| in MHz used for the demo lines: 2.16 MHz, the "later work" value beside Felton et
 * al., PRB 79, 075203 (2009) (−2.14(7) MHz, the value in lib/physics/constants); see
 * Steiner et al., PRB 81, 035205 (2010) (from memory).
 */
export const DEMO_14N_SPLITTING_MHZ = 2.16;

interface OdmrSpec {
  key: string;
  fileName: string;
  name: string;
  group: SampleGroup;
  centre: string;
  fieldMilliTesla: number;
  range: [number, number];
  points: number;
  fwhmMHz: number;
  contrast: number;
  noise: number;
  hyperfine: boolean;
  european: boolean;
  when: string;
  power: string;
}

const SPECS: readonly OdmrSpec[] = [
  {
    key: "low-field",
    fileName: `odmr_${SAMPLE}-NV06_4p2mT.csv`,
    name: `ODMR, NV06 at 4.2 mT, ¹⁴N resolved (sample ${SAMPLE})`,
    group: "annealed-1200C",
    centre: "NV06",
    fieldMilliTesla: 4.2,
    range: [2700, 3050],
    points: 2000,
    fwhmMHz: 1.0,
    contrast: 0.03,
    noise: 0.0035,
    hyperfine: true,
    european: false,
    when: measuredAt(2, 10, 11, 5),
    power: "-18 dBm at the source (low power, narrow lines)",
  },
  {
    key: "european",
    fileName: `odmr_${SAMPLE}-NV10_6mT_export.csv`,
    name: `ODMR, NV10 at 6 mT (sample ${SAMPLE})`,
    group: "oxygen-terminated",
    centre: "NV10",
    fieldMilliTesla: 6.0,
    range: [2650, 3100],
    points: 1801,
    fwhmMHz: 1.3,
    contrast: 0.025,
    noise: 0.004,
    hyperfine: true,
    european: true,
    when: measuredAt(3, 4, 16, 20),
    power: "-16 dBm at the source",
  },
  {
    key: "high-field",
    fileName: `odmr_${SAMPLE}-NV02_20mT.csv`,
    name: `ODMR, NV02 at 20 mT (sample ${SAMPLE})`,
    group: "as-grown",
    centre: "NV02",
    fieldMilliTesla: 20,
    range: [2200, 3550],
    points: 1351,
    fwhmMHz: 9,
    contrast: 0.022,
    noise: 0.003,
    hyperfine: false,
    european: false,
    when: measuredAt(2, 17, 9, 50),
    power: "+2 dBm at the source (power-broadened)",
  },
];

function lineCentres(spec: OdmrSpec): { fMinus: number; fPlus: number; lines: number[] } {
  const { fMinus, fPlus } = odmrResonances(spec.fieldMilliTesla * 1e-3);
  const toMHz = (hz: number) => hz / 1e6;
  const a = DEMO_14N_SPLITTING_MHZ;
  const lines = [toMHz(fMinus), toMHz(fPlus)].flatMap((f) => (spec.hyperfine ? [f - a, f, f + a] : [f]));
  return { fMinus: toMHz(fMinus), fPlus: toMHz(fPlus), lines };
}

function odmrFile(spec: OdmrSpec): DemoFile {
  const rng = new Rng(`odmr/${spec.key}/${spec.centre}`);
  const { fMinus, fPlus, lines } = lineCentres(spec);
  const sep = spec.european ? ";" : ",";
  const num = (x: number, d: number) => (spec.european ? fixed(x, d).replace(".", ",") : fixed(x, d));
  const rows = linSpace(spec.range[0], spec.range[1], spec.points).map((f) => {
    let dip = 0;
    for (const c of lines) dip += spec.contrast * lorentz(f, c, spec.fwhmMHz);
    return `${num(f, 3)}${sep}${num(1 - dip + rng.normal(0, spec.noise), 5)}`;
  });
  const header = commentHeader([
    ["title", `CW ODMR, ${spec.centre}`],
    ...standardHeader(CONFOCAL, spec.group, spec.when),
    ["centre", spec.centre],
    ["bias magnet", "permanent magnet aligned to the NV axis"],
    ["microwave power", spec.power],
    ["laser", "532 nm, 0.3 mW, continuous"],
    ["normalisation", "PL divided by off-resonance reference"],
  ]);
  const columns = spec.european ? "f [MHz];PL [norm]" : "frequency (MHz),pl (a.u.)";
  const dMHz = NV_ZERO_FIELD_SPLITTING / 1e6;
  const notes =
    `Generated: B = ${spec.fieldMilliTesla} mT along the NV axis, D = ${dMHz} MHz → f₋ = ${fixed(fMinus, 3)} MHz, ` +
    `f₊ = ${fixed(fPlus, 3)} MHz (f± = D ± γ_NV·B, γ_NV = ${fixed(NV_GAMMA / 1e9, 4)} GHz/T). ` +
    (spec.hyperfine ? `Each line a ¹⁴N triplet spaced ${DEMO_14N_SPLITTING_MHZ} MHz; ` : "Two lines only, hyperfine not resolved; ") +
    `Lorentzian FWHM ${spec.fwhmMHz} MHz, contrast ${spec.contrast * 100} % per line, Gaussian noise σ = ${spec.noise}.` +
    (spec.european ? " Exported by a PC with a European locale: ';' separator, decimal comma." : "");
  return {
    fileName: spec.fileName,
    name: spec.name,
    kind: "odmr",
    sample: SAMPLE,
    instrument: CONFOCAL,
    measuredAt: spec.when,
    notes,
    tags: { group: spec.group, centre: spec.centre, field: `${spec.fieldMilliTesla} mT` },
    content: header + columns + "\n" + rows.join("\n") + "\n",
  };
}

export function odmrFiles(): DemoFile[] {
  return SPECS.map(odmrFile);
}
