/**
 * Two-group comparison for population statistics (e.g. T2 of NV centres in two samples):
 * location by Welch's t and Mann–Whitney U, spread by Brown–Forsythe. Values in any common unit.
 * Non-finite values are dropped with a note; small groups give NaN with a note, never a throw.
 */
import { type BrownForsytheResult, brownForsythe } from "./brown-forsythe";
import { finiteValues } from "./describe";
import { type MannWhitneyResult, mannWhitneyU } from "./mann-whitney";
import { type WelchResult, welchTTest } from "./welch";

export interface GroupComparison {
  nA: number;
  nB: number;
  welch: WelchResult;
  mannWhitney: MannWhitneyResult;
  brownForsythe: BrownForsytheResult;
  notes: string[];
}

/** How compareGroups() computes what it reports; shown beside tables of results. */
export const COMPARE_GROUPS_METHOD =
  "Welch's t-test (Welch–Satterthwaite df, two-sided p); Mann–Whitney U of group A with two-sided p, exact when " +
  "there are no ties and both groups have < 50 values, otherwise normal approximation with tie correction and " +
  "continuity correction; Brown–Forsythe test (ANOVA on absolute deviations from group medians) for spread.";

/** Compares group a with group b: Welch's t, Mann–Whitney U and Brown–Forsythe. */
export function compareGroups(a: readonly number[], b: readonly number[]): GroupComparison {
  const fa = finiteValues(a);
  const fb = finiteValues(b);
  const notes: string[] = [];
  if (fa.dropped > 0) notes.push(`${fa.dropped} non-finite value(s) ignored in group A.`);
  if (fb.dropped > 0) notes.push(`${fb.dropped} non-finite value(s) ignored in group B.`);
  return {
    nA: fa.kept.length,
    nB: fb.kept.length,
    welch: welchTTest(fa.kept, fb.kept),
    mannWhitney: mannWhitneyU(fa.kept, fb.kept),
    brownForsythe: brownForsythe([fa.kept, fb.kept]),
    notes,
  };
}
