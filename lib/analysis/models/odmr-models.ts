/**
 * ODMR spectra as Lorentzian dips on a baseline, y = B·(1 − Σₖ cₖ·Lₖ(f)) with the
 * peak-normalised Lorentzian L(f) = (w/2)²/((f − f₀)² + (w/2)²): f, f₀, w and the splitting
 * |A∥| are in the x column's unit (MHz in typical data; the expected ¹⁴N and ¹⁵N |A∥| come from
 * lib/physics/constants), B in y units, the contrast c dimensionless (0 … 1).
 *
 * Models with k independent dips have ids odmr_lorentzian_1 … odmr_lorentzian_4, with
 * parameters B, f1, w1, c1, f2, w2, c2, … in ascending f order of the start values.
 */
import type { CurveSweep } from "../fit/curve-problem";
import { contrastAt, dipProfile, findDips, type Dip } from "./guess/dip-guess";
import { matchLinePattern } from "./guess/line-pattern";
import { median, xScale } from "./guess/signal-features";
import { N14_SPLITTING_RANGE, N15_SPLITTING_RANGE } from "./physical-ranges";
import type { FitModel, ModelParam, ModelSuggestion, PhysicalRange } from "./types";
import { NV_14N_SPLITTING_MHZ, NV_15N_SPLITTING_MHZ } from "@/lib/physics/constants";

/** Peak-normalised Lorentzian with full width `width` at half maximum. */
function lorentzian(f: number, centre: number, width: number): number {
  const q = (2 * (f - centre)) / width;
  return 1 / (1 + q * q);
}

function dipsOrDefault(x: ArrayLike<number>, y: ArrayLike<number>, count: number): { baseline: number; dips: Dip[] } {
  const profile = dipProfile(x, y);
  const { span, min } = xScale(x);
  const dips = findDips(profile, count);
  const widths = dips.map((d) => d.width).filter(Number.isFinite);
  const typicalWidth = widths.length > 0 ? median(widths) : span / 10;
  if (dips.length === 0) dips.push({ position: min + span / 2, depth: 0.01, width: typicalWidth });
  for (const dip of dips) if (!Number.isFinite(dip.width)) dip.width = typicalWidth;
  // Not enough separate dips: split the deepest ones, as overlapping lines would be.
  for (let k = 0; dips.length < count; k++) {
    const source = dips[k % dips.length];
    dips.push({ position: source.position + source.width / 2, depth: source.depth / 2, width: source.width / 2 });
    source.position -= source.width / 2;
    source.width /= 2;
  }
  return { baseline: profile.baseline, dips: dips.slice(0, count).sort((a, b) => a.position - b.position) };
}

function dipBounds(x: ArrayLike<number>): { position: [number, number]; width: [number, number]; depth: [number, number] } {
  const { min, max, span, step } = xScale(x);
  return { position: [min, max], width: [step / 10, span], depth: [0, 1] };
}

/** A valley between dips wider than this many typical line widths (and than 1/20 of the sweep) separates two groups. */
const GROUP_GAP_WIDTHS = 10;
/** A group counts when its deepest dip is at least this fraction of the deepest dip of the spectrum. */
const GROUP_DEPTH_FRACTION = 1 / 3;

/**
 * Groups of dips in the spectrum (centre as the mean position of their dips, in x units): dips
 * closer than GROUP_GAP_WIDTHS typical widths belong to one group, as the hyperfine lines of one
 * resonance do; shallow groups (noise) are left out.
 */
export function dipGroups(x: ArrayLike<number>, y: ArrayLike<number>): Array<{ centre: number; depth: number; dips: number }> {
  const profile = dipProfile(x, y);
  const dips = findDips(profile, 8).sort((a, b) => a.position - b.position);
  if (dips.length === 0) return [];
  const widths = dips.map((d) => d.width).filter(Number.isFinite);
  const gap = Math.max(GROUP_GAP_WIDTHS * (widths.length > 0 ? median(widths) : profile.step), xScale(x).span / 20);
  const groups: Array<typeof dips> = [[dips[0]]];
  for (let k = 1; k < dips.length; k++) {
    if (dips[k].position - dips[k - 1].position > gap) groups.push([]);
    groups[groups.length - 1].push(dips[k]);
  }
  const deepest = Math.max(...dips.map((d) => d.depth));
  return groups
    .map((g) => ({ centre: g.reduce((s, d) => s + d.position, 0) / g.length, depth: Math.max(...g.map((d) => d.depth)), dips: g.length }))
    .filter((g) => g.depth >= GROUP_DEPTH_FRACTION * deepest);
}

const showPosition = (v: number): string => String(Number(v.toPrecision(5)));

/**
 * For models of one resonance: when the spectrum shows two to four separate groups of dips (f₋ and
 * f₊ of one NV, or several orientations), names the model with one line per group; for two groups,
 * `twoGroups` (the hyperfine models name the f₋/f₊ model with the same hyperfine lines in each group).
 */
function suggestForGroups(x: ArrayLike<number>, y: ArrayLike<number>, twoGroups = "odmr_two_resonances"): ModelSuggestion | undefined {
  const groups = dipGroups(x, y);
  if (groups.length < 2 || groups.length > 4) return undefined;
  const near = groups.map((g) => showPosition(g.centre));
  const listed = `${near.slice(0, -1).join(", ")} and ${near[near.length - 1]}`;
  const reason = `the data show ${groups.length} separate groups of dips (near ${listed}) but this model describes one resonance`;
  return groups.length === 2 ? { modelId: twoGroups, reason } : { modelId: `odmr_lorentzian_${groups.length}`, reason };
}

function multiDipModel(id: string, title: string, kinds: string[], names: Array<[string, string, string]>): FitModel {
  const count = names.length;
  const params: ModelParam[] = [{ name: "B", unit: "y", description: "baseline signal off resonance" }];
  names.forEach(([f, w, c], k) => {
    params.push({ name: f, unit: "x", description: `centre frequency of dip ${k + 1}` });
    params.push({ name: w, unit: "x", description: `full width at half depth of dip ${k + 1}` });
    params.push({ name: c, unit: "1", description: `contrast (fractional depth) of dip ${k + 1}` });
  });
  // Every dip is subtracted from the baseline: 1 − c1·L1 − c2·L2 − …, as evaluate computes.
  const terms = names.map(([f, w, c]) => `${c}·L(f; ${f}, ${w})`).join(" − ");
  const valueAndJacobian = (f: number, p: ArrayLike<number>, out: Float64Array): number => {
    const b = p[0];
    let sum = 0;
    for (let k = 0; k < count; k++) {
      const width = p[3 * k + 2];
      const c = p[3 * k + 3];
      const q = (2 * (f - p[3 * k + 1])) / width;
      const l = 1 / (1 + q * q);
      sum += c * l;
      out[3 * k + 1] = (-b * c * 4 * q * l * l) / width;
      out[3 * k + 2] = (-b * c * 2 * q * q * l * l) / width;
      out[3 * k + 3] = -b * l;
    }
    out[0] = 1 - sum;
    return b * (1 - sum);
  };
  return {
    id,
    title,
    formula: `y = B·(1 − ${terms}),  L = (w/2)²/((f − f₀)² + (w/2)²)`,
    version: "1.0.0",
    kinds,
    params,
    evaluate(f, p) {
      let sum = 0;
      for (let k = 0; k < count; k++) sum += p[3 * k + 3] * lorentzian(f, p[3 * k + 1], p[3 * k + 2]);
      return p[0] * (1 - sum);
    },
    jacobian: valueAndJacobian,
    valueAndJacobian,
    guess(x, y) {
      const { baseline, dips } = dipsOrDefault(x, y, count);
      const { span } = xScale(x);
      return [baseline, ...dips.flatMap((d) => [d.position, Math.min(d.width, span), Math.min(1, Math.max(1e-3, d.depth))])];
    },
    bounds(x) {
      const b = dipBounds(x);
      return [[0, Infinity], ...names.flatMap(() => [b.position, b.width, b.depth])];
    },
    amplitudes: names.map(([f, w, c]) => ({ amplitude: c, shapes: [f, w] })),
    ...(count === 1 ? { suggest: (x: ArrayLike<number>, y: ArrayLike<number>) => suggestForGroups(x, y) } : {}),
  };
}

/** `twoGroups`: the model with this pattern on both f₋ and f₊, suggested when the data show two groups of dips. */
function patternDipModel(
  id: string,
  title: string,
  nucleus: string,
  splittingMHz: number,
  pattern: readonly number[],
  plausible: PhysicalRange,
  twoGroups: string,
): FitModel {
  const lines = pattern.map((k) => (k === 0 ? "f₀" : `f₀ ${k < 0 ? "−" : "+"} ${Math.abs(k) === 1 ? "" : "½"}|A∥|`));
  const valueAndJacobian = (f: number, p: ArrayLike<number>, out: Float64Array): number => {
    const b = p[0];
    const width = p[3];
    const c = p[4];
    let sum = 0;
    let dCentre = 0;
    let dSplit = 0;
    let dWidth = 0;
    for (const k of pattern) {
      const q = (2 * (f - p[1] - k * p[2])) / width;
      const l = 1 / (1 + q * q);
      const slope = (4 * q * l * l) / width;
      sum += l;
      dCentre += slope;
      dSplit += k * slope;
      dWidth += (2 * q * q * l * l) / width;
    }
    out[0] = 1 - c * sum;
    out[1] = -b * c * dCentre;
    out[2] = -b * c * dSplit;
    out[3] = -b * c * dWidth;
    out[4] = -b * sum;
    return b * (1 - c * sum);
  };
  // valueAndJacobian over a whole dataset, weighted, in one pass.
  const prepareSweep = (x: Float64Array, y: Float64Array, weight: Float64Array): CurveSweep => {
    const m = x.length;
    return (p, residuals, jac) => {
      const b = p[0];
      const centre = p[1];
      const split = p[2];
      const width = p[3];
      const c = p[4];
      const halfWidth = width / 2;
      const bc = b * c;
      for (let i = 0; i < m; i++) {
        let sum = 0;
        let dCentre = 0;
        let dSplit = 0;
        let dWidth = 0;
        for (let l = 0; l < pattern.length; l++) {
          const k = pattern[l];
          const q = (x[i] - centre - k * split) / halfWidth;
          const line = 1 / (1 + q * q);
          const slope = (4 * q * line * line) / width;
          sum += line;
          dCentre += slope;
          dSplit += k * slope;
          dWidth += (2 * q * q * line * line) / width;
        }
        const w = weight[i];
        residuals[i] = (b * (1 - c * sum) - y[i]) * w;
        jac[i] = (1 - c * sum) * w;
        jac[m + i] = -bc * dCentre * w;
        jac[2 * m + i] = -bc * dSplit * w;
        jac[3 * m + i] = -bc * dWidth * w;
        jac[4 * m + i] = -b * sum * w;
      }
    };
  };
  return {
    id,
    title,
    formula: `y = B·(1 − c·Σ L(f; fₘ, w)),  fₘ ∈ {${lines.join(", ")}}`,
    version: "1.0.0",
    kinds: ["odmr"],
    params: [
      { name: "B", unit: "y", description: "baseline signal off resonance" },
      { name: "f0", unit: "x", description: "centre of the hyperfine group" },
      { name: "Apar", unit: "x", description: `${nucleus} hyperfine splitting |A∥| (${splittingMHz} MHz when x is in MHz)` },
      { name: "w", unit: "x", description: "full width at half depth of each line" },
      { name: "c", unit: "1", description: "contrast (fractional depth) of each line" },
    ],
    evaluate(f, p) {
      let sum = 0;
      for (const k of pattern) sum += lorentzian(f, p[1] + k * p[2], p[3]);
      return p[0] * (1 - p[4] * sum);
    },
    jacobian: valueAndJacobian,
    valueAndJacobian,
    prepareSweep,
    guess(x, y) {
      const profile = dipProfile(x, y);
      const { span } = xScale(x);
      const dips = findDips(profile, 6);
      const score = (centre: number, spacing: number): number => pattern.reduce((total, k) => total + contrastAt(profile, centre + k * spacing), 0);
      const match = matchLinePattern(
        dips.map((d) => d.position),
        pattern,
        score,
        3 * profile.step,
      );
      const widths = dips.map((d) => d.width).filter(Number.isFinite);
      const typicalWidth = widths.length > 0 ? median(widths) : span / 10;
      if (!match) {
        const position = dips[0]?.position ?? profile.x[0] + span / 2;
        return [profile.baseline, position, typicalWidth / 3, typicalWidth / 3, Math.max(1e-3, dips[0]?.depth ?? 0.01)];
      }
      const depth = score(match.centre, match.spacing) / pattern.length;
      const width = Math.min(typicalWidth, match.spacing);
      return [profile.baseline, match.centre, match.spacing, width, Math.min(1, Math.max(1e-3, depth))];
    },
    bounds(x) {
      const b = dipBounds(x);
      const { span } = xScale(x);
      return [[0, Infinity], b.position, [0, span], b.width, b.depth];
    },
    amplitudes: [{ amplitude: "c", shapes: ["f0", "Apar", "w"] }],
    physicalRanges: [plausible],
    suggest: (x, y) => suggestForGroups(x, y, twoGroups),
  };
}

const indexedNames = (count: number): Array<[string, string, string]> => Array.from({ length: count }, (_, k) => [`f${k + 1}`, `w${k + 1}`, `c${k + 1}`]);

export const odmrLorentzianModels: FitModel[] = [1, 2, 3, 4].map((count) =>
  multiDipModel(`odmr_lorentzian_${count}`, `ODMR, ${count} Lorentzian dip${count > 1 ? "s" : ""}`, ["odmr"], indexedNames(count)),
);

export const odmrTwoResonancesModel: FitModel = multiDipModel(
  "odmr_two_resonances",
  "ODMR, f₋ and f₊ resonances",
  ["odmr"],
  [
    ["fMinus", "wMinus", "cMinus"],
    ["fPlus", "wPlus", "cPlus"],
  ],
);

export const odmr14nTripletModel: FitModel = patternDipModel(
  "odmr_14n_triplet",
  "ODMR, ¹⁴N hyperfine triplet",
  "¹⁴N",
  NV_14N_SPLITTING_MHZ,
  [-1, 0, 1],
  N14_SPLITTING_RANGE,
  "odmr_14n_two_groups",
);

export const odmr15nDoubletModel: FitModel = patternDipModel(
  "odmr_15n_doublet",
  "ODMR, ¹⁵N hyperfine doublet",
  "¹⁵N",
  NV_15N_SPLITTING_MHZ,
  [-0.5, 0.5],
  N15_SPLITTING_RANGE,
  "odmr_15n_two_groups",
);
