/** Population statistics: descriptive summaries, two-group tests and per-group summaries. */
export { describe, DESCRIBE_METHOD, quantileSorted, medianSorted, mean, sampleVariance, type Description } from "./describe";
export { compareGroups, COMPARE_GROUPS_METHOD, type GroupComparison } from "./compare-groups";
export { welchTTest, type WelchResult } from "./welch";
export { mannWhitneyU, mannWhitneyExactDistribution, MANN_WHITNEY_EXACT_LIMIT, type MannWhitneyResult } from "./mann-whitney";
export { brownForsythe, absoluteDeviationsFromMedian, type BrownForsytheResult } from "./brown-forsythe";
export { groupBy, type GroupSummary } from "./group-by";
export { studentTTwoSidedP, studentTQuantile, fUpperP, normalTwoSidedP } from "./distributions";
