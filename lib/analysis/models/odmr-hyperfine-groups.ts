/**
 * Both electron-spin resonances of one NV centre, f₋ and f₊, each split by the nitrogen hyperfine
 * interaction: the ¹⁴N triplet (lines at f± + k·|A∥|, k = −1, 0, 1) or the ¹⁵N doublet
 * (k = ±½), every line a peak-normalised Lorentzian dip L(f) = (w/2)²/((f − fₘ)² + (w/2)²) of one
 * shared width w, the lines of one group sharing a contrast:
 *   y = B·(1 − c₋·Σₖ L(f; f₋ + k·|A∥|, w) − c₊·Σₖ L(f; f₊ + k·|A∥|, w)).
 * The form is the standard CW-ODMR line shape of the NV ground state in a weak axial field
 * (Doherty et al., Phys. Rep. 528, 1 (2013), §4; from memory). f, f±, |A∥| and w are in the x
 * column's unit (MHz in typical data), B in y units, contrasts dimensionless (0 … 1). Derived:
 * D = (f₋ + f₊)/2 and the splitting f₊ − f₋ = 2γB for a field along the axis.
 */
import { contrastAt, dipProfile, findDips, type DipProfile } from "./guess/dip-guess";
import { matchLinePattern } from "./guess/line-pattern";
import { median, xScale } from "./guess/signal-features";
import { dipGroups } from "./odmr-models";
import { N14_SPLITTING_RANGE, N15_SPLITTING_RANGE } from "./physical-ranges";
import type { DerivedQuantity, FitModel, PhysicalRange } from "./types";
import { NV_14N_SPLITTING_MHZ, NV_15N_SPLITTING_MHZ, NV_ZERO_FIELD_SPLITTING } from "@/lib/physics/constants";

/** Parameter order: B, fMinus, fPlus, Apar, w, cMinus, cPlus. */
const B = 0,
  F_MINUS = 1,
  F_PLUS = 2,
  SPLIT = 3,
  WIDTH = 4,
  C_MINUS = 5,
  C_PLUS = 6;

/** D in MHz, for telling the x column's frequency unit from where the sweep lies (see `mhzPerUnit`). */
const D_MHZ = NV_ZERO_FIELD_SPLITTING / 1e6;

/**
 * MHz per x unit, judged from the sweep's middle: an NV sweep lies within a factor 30 of D = 2870 MHz
 * in every field below ≈ 1 T, so a middle near 2.87 means GHz, near 2870 MHz, near 2.87e9 Hz
 * (powers of 1000 apart). The model sees numbers, not units; this only scales the default |A∥| bounds.
 */
function mhzPerUnit(x: ArrayLike<number>): number {
  const { min, max } = xScale(x);
  const middle = (min + max) / 2;
  if (!(middle > 0)) return NaN;
  const k = Math.round(Math.log10(middle / D_MHZ) / 3);
  return 1000 ** -k;
}

/** Sum over the pattern's lines of L and its derivatives at f for a group centred on `centre`. */
function groupSums(f: number, centre: number, split: number, width: number, pattern: readonly number[]) {
  let sum = 0,
    dCentre = 0,
    dSplit = 0,
    dWidth = 0;
  for (const k of pattern) {
    const q = (2 * (f - centre - k * split)) / width;
    const l = 1 / (1 + q * q);
    const slope = (4 * q * l * l) / width;
    sum += l;
    dCentre += slope;
    dSplit += k * slope;
    dWidth += (2 * q * q * l * l) / width;
  }
  return { sum, dCentre, dSplit, dWidth };
}

/** Best match of the pattern to the dips of one group (x between lo and hi), or undefined. */
function guessGroup(profile: DipProfile, x: ArrayLike<number>, y: ArrayLike<number>, lo: number, hi: number, pattern: readonly number[]) {
  const xs: number[] = [];
  const ys: number[] = [];
  for (let i = 0; i < x.length; i++)
    if (x[i] >= lo && x[i] <= hi) {
      xs.push(x[i]);
      ys.push(y[i]);
    }
  if (xs.length < 8) return undefined;
  const local = dipProfile(xs, ys);
  const dips = findDips(local, 2 * pattern.length);
  if (dips.length === 0) return undefined;
  const score = (centre: number, spacing: number): number => pattern.reduce((total, k) => total + contrastAt(profile, centre + k * spacing), 0);
  const widths = dips.map((d) => d.width).filter(Number.isFinite);
  const width = widths.length > 0 ? median(widths) : (hi - lo) / 20;
  const match = matchLinePattern(
    dips.map((d) => d.position),
    pattern,
    score,
    3 * profile.step,
  );
  if (!match) return { centre: dips[0].position, spacing: NaN, width, depth: dips[0].depth };
  return { centre: match.centre, spacing: match.spacing, width: Math.min(width, match.spacing), depth: score(match.centre, match.spacing) / pattern.length };
}

/** `oneGroup`: the model of a single group with the same hyperfine lines, suggested when the data show only one group of dips. */
function hyperfineGroupsModel(
  id: string,
  title: string,
  nucleus: string,
  splittingMHz: number,
  pattern: readonly number[],
  plausible: PhysicalRange,
  oneGroup: string,
): FitModel {
  const valueAndJacobian = (f: number, p: ArrayLike<number>, out: Float64Array): number => {
    const b = p[B];
    const minus = groupSums(f, p[F_MINUS], p[SPLIT], p[WIDTH], pattern);
    const plus = groupSums(f, p[F_PLUS], p[SPLIT], p[WIDTH], pattern);
    const cm = p[C_MINUS];
    const cp = p[C_PLUS];
    const shape = 1 - cm * minus.sum - cp * plus.sum;
    out[B] = shape;
    out[F_MINUS] = -b * cm * minus.dCentre;
    out[F_PLUS] = -b * cp * plus.dCentre;
    out[SPLIT] = -b * (cm * minus.dSplit + cp * plus.dSplit);
    out[WIDTH] = -b * (cm * minus.dWidth + cp * plus.dWidth);
    out[C_MINUS] = -b * minus.sum;
    out[C_PLUS] = -b * plus.sum;
    return b * shape;
  };
  const lines = (group: string) => pattern.map((k) => (k === 0 ? group : `${group} ${k < 0 ? "−" : "+"} ${Math.abs(k) === 1 ? "" : "½"}|A∥|`)).join(", ");
  const derived: DerivedQuantity[] = [
    {
      name: "D",
      unit: "x",
      description: "zero-field splitting, the mean of the two resonances (field along the NV axis)",
      formula: "D = (f₋ + f₊)/2",
      value: (p) => (p[F_MINUS] + p[F_PLUS]) / 2,
      gradient: () => [0, 0.5, 0.5, 0, 0, 0, 0],
    },
    {
      name: "splitting",
      unit: "x",
      description: "distance between the resonances, 2γ_NV·B for a field B along the NV axis",
      formula: "Δ = f₊ − f₋",
      value: (p) => p[F_PLUS] - p[F_MINUS],
      gradient: () => [0, -1, 1, 0, 0, 0, 0],
    },
  ];
  return {
    id,
    title,
    formula: `y = B·(1 − c₋·Σ L(f; fₘ, w) − c₊·Σ L(f; fₙ, w)),  fₘ ∈ {${lines("f₋")}},  fₙ ∈ {${lines("f₊")}},  L = (w/2)²/((f − fₘ)² + (w/2)²)`,
    version: "1.0.0",
    kinds: ["odmr"],
    params: [
      { name: "B", unit: "y", description: "baseline signal off resonance" },
      { name: "fMinus", unit: "x", description: "centre of the lower resonance's hyperfine group (f₋)" },
      { name: "fPlus", unit: "x", description: "centre of the upper resonance's hyperfine group (f₊)" },
      { name: "Apar", unit: "x", description: `${nucleus} hyperfine splitting |A∥|, shared by both groups (${splittingMHz} MHz when x is in MHz)` },
      { name: "w", unit: "x", description: "full width at half depth of every line" },
      { name: "cMinus", unit: "1", description: "contrast (fractional depth) of each line of the f₋ group" },
      { name: "cPlus", unit: "1", description: "contrast (fractional depth) of each line of the f₊ group" },
    ],
    evaluate(f, p) {
      let minus = 0,
        plus = 0;
      for (const k of pattern) {
        const qm = (2 * (f - p[F_MINUS] - k * p[SPLIT])) / p[WIDTH];
        const qp = (2 * (f - p[F_PLUS] - k * p[SPLIT])) / p[WIDTH];
        minus += 1 / (1 + qm * qm);
        plus += 1 / (1 + qp * qp);
      }
      return p[B] * (1 - p[C_MINUS] * minus - p[C_PLUS] * plus);
    },
    jacobian: valueAndJacobian,
    valueAndJacobian,
    guess(x, y) {
      const profile = dipProfile(x, y);
      const { min, max, span } = xScale(x);
      // The two deepest groups of dips, in order of frequency; without two, the sweep's halves.
      const groups = dipGroups(x, y)
        .sort((a, b) => b.depth - a.depth)
        .slice(0, 2)
        .sort((a, b) => a.centre - b.centre);
      const cut = groups.length === 2 ? (groups[0].centre + groups[1].centre) / 2 : min + span / 2;
      const lower = guessGroup(profile, x, y, min, cut, pattern);
      const upper = guessGroup(profile, x, y, cut, max, pattern);
      const [aLo, aHi] = splitBounds(x);
      const expected = splittingMHz / mhzPerUnit(x);
      const spacings = [lower?.spacing, upper?.spacing].filter((s): s is number => s !== undefined && s >= aLo && s <= aHi);
      const spacing = spacings.length ? median(spacings) : Number.isFinite(expected) ? expected : span / 100;
      const widths = [lower?.width, upper?.width].filter((w): w is number => w !== undefined && Number.isFinite(w));
      const width = Math.min(widths.length ? median(widths) : span / 100, spacing);
      const depth = (g: typeof lower) => Math.min(1, Math.max(1e-3, g?.depth ?? 0.01));
      return [
        profile.baseline,
        lower?.centre ?? min + span / 4,
        upper?.centre ?? max - span / 4,
        Math.min(aHi, Math.max(aLo, spacing)),
        width,
        depth(lower),
        depth(upper),
      ];
    },
    bounds(x) {
      const { min, max, span, step } = xScale(x);
      return [[0, Infinity], [min, max], [min, max], splitBounds(x), [step / 10, span], [0, 1], [0, 1]];
    },
    derived,
    amplitudes: [
      { amplitude: "cMinus", shapes: ["fMinus"] },
      { amplitude: "cPlus", shapes: ["fPlus"] },
    ],
    physicalRanges: [plausible],
    suggest(x, y) {
      const groups = dipGroups(x, y);
      if (groups.length !== 1) return undefined;
      const near = String(Number(groups[0].centre.toPrecision(5)));
      return { modelId: oneGroup, reason: `the data show one group of dips (near ${near}) but this model describes two resonances, f₋ and f₊` };
    },
  };

  /** |A∥| between the physical range's ends in the x unit read from the sweep; [0, span] when the unit cannot be told. */
  function splitBounds(x: ArrayLike<number>): [number, number] {
    const perUnit = mhzPerUnit(x);
    if (Number.isFinite(perUnit)) return [plausible.range[0] / perUnit, plausible.range[1] / perUnit];
    return [0, xScale(x).span];
  }
}

export const odmr14nTwoGroupsModel: FitModel = hyperfineGroupsModel(
  "odmr_14n_two_groups",
  "ODMR, f₋ and f₊ with ¹⁴N hyperfine triplets",
  "¹⁴N",
  NV_14N_SPLITTING_MHZ,
  [-1, 0, 1],
  N14_SPLITTING_RANGE,
  "odmr_14n_triplet",
);

export const odmr15nTwoGroupsModel: FitModel = hyperfineGroupsModel(
  "odmr_15n_two_groups",
  "ODMR, f₋ and f₊ with ¹⁵N hyperfine doublets",
  "¹⁵N",
  NV_15N_SPLITTING_MHZ,
  [-0.5, 0.5],
  N15_SPLITTING_RANGE,
  "odmr_15n_doublet",
);
