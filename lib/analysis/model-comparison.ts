/**
 * Model comparison on one dataset: two to four candidates (models, or one model with parameters
 * held at chosen values), each fitted alone, ranked by AIC with Akaike weights, with BIC beside it
 * and an extra-sum-of-squares F-test for every nested pair (Burnham & Anderson, "Model Selection
 * and Multimodel Inference", 2nd ed., Springer 2002, §2.2 and §2.9; the F-test for nested
 * least-squares models as in Bevington & Robinson, "Data Reduction and Error Analysis", 3rd ed.,
 * §11.4).
 *
 * The preferred candidate has the lowest AIC among those whose fit converged and is not judged
 * unsupported by the data — unless a simpler candidate nested in it is within 2 of its AIC and the
 * F-test does not reject the simpler one at the 5 % level: then the simpler one is preferred
 * (a difference below 2 is no real support for the extra parameters; Burnham & Anderson §2.6).
 */
import { fitModel, type FitInput, type ModelFitResult } from "./fit-model";
import { FitInputError } from "./fit-input-error";
import { getModelOrThrow } from "./model-lookup";
import { fUpperP } from "./stats/distributions";

export interface Candidate {
  label: string;
  model: string;
  start?: Record<string, number>;
  fixed?: Record<string, number>;
  bounds?: Record<string, [number, number]>;
}

export interface ComparisonData {
  x: ArrayLike<number>;
  y: ArrayLike<number>;
  sigma?: ArrayLike<number>;
  xUnit?: string | null;
}

interface RankedCandidate {
  label: string;
  modelId: string;
  fit: ModelFitResult;
  /** Free parameters. */
  k: number;
  deltaAic: number;
  deltaBic: number;
  /** exp(−ΔAIC/2) normalised over the candidates. */
  akaikeWeight: number;
  /** Converged and not judged unsupported by the data. */
  eligible: boolean;
}

interface NestedTest {
  /** Labels of the simpler candidate and of the one it is nested in. */
  simpler: string;
  fuller: string;
  f: number;
  df1: number;
  df2: number;
  p: number;
  /** p < 0.05: the extra parameters of the fuller candidate are needed. */
  rejectsSimpler: boolean;
}

export interface ModelComparison {
  candidates: RankedCandidate[];
  tests: NestedTest[];
  /** Label of the preferred candidate; null when no fit converged. */
  preferred: string | null;
  reason: string;
}

const MIN_CANDIDATES = 2;
const MAX_CANDIDATES = 4;
const SIGNIFICANCE = 0.05;
/** ΔAIC below which a candidate has substantial support beside the best (Burnham & Anderson 2002, §2.6). */
const SUBSTANTIAL_SUPPORT = 2;

/**
 * Models that are a special case of another with parameters held (beyond one model with fixed
 * parameters, which is found from the candidates themselves).
 */
const SPECIAL_CASES: Array<{ model: string; of: string; holding: Record<string, number> }> = [
  { model: "relaxation", of: "relaxation_stretched", holding: { n: 1 } },
];

const show = (v: number, digits = 3) => String(Number(v.toPrecision(digits)));

function freeNames(c: Candidate): string[] {
  return getModelOrThrow(c.model)
    .params.map((p) => p.name)
    .filter((n) => !(c.fixed && n in c.fixed));
}

/** Whether `a` is `b` with some of b's free parameters held (same model, or a declared special case). */
function nestedIn(a: Candidate, b: Candidate): boolean {
  const freeA = freeNames(a);
  const freeB = freeNames(b);
  if (a.model === b.model) {
    if (!(freeA.length < freeB.length && freeA.every((n) => freeB.includes(n)))) return false;
    return Object.entries(b.fixed ?? {}).every(([n, v]) => a.fixed?.[n] === v);
  }
  const declared = SPECIAL_CASES.find((s) => s.model === a.model && s.of === b.model);
  if (!declared) return false;
  const heldInB = Object.keys(declared.holding).filter((n) => freeB.includes(n));
  return (
    heldInB.length > 0 &&
    freeA.length < freeB.length &&
    freeA.every((n) => freeB.includes(n)) &&
    Object.keys(b.fixed ?? {}).every((n) => a.fixed?.[n] === b.fixed![n])
  );
}

function fTest(simpler: RankedCandidate, fuller: RankedCandidate): NestedTest {
  const df1 = fuller.k - simpler.k;
  const df2 = fuller.fit.dof;
  const f = (simpler.fit.chi2 - fuller.fit.chi2) / df1 / (fuller.fit.chi2 / df2);
  const p = f > 0 ? fUpperP(f, df1, df2) : 1;
  return { simpler: simpler.label, fuller: fuller.label, f: Math.max(f, 0), df1, df2, p, rejectsSimpler: p < SIGNIFICANCE };
}

export function compareModels(candidates: Candidate[], data: ComparisonData): ModelComparison {
  if (candidates.length < MIN_CANDIDATES || candidates.length > MAX_CANDIDATES) {
    throw new FitInputError(`compare ${MIN_CANDIDATES} to ${MAX_CANDIDATES} candidates (${candidates.length} given)`, "candidates");
  }
  const labels = candidates.map((c) => c.label.trim());
  const twice = labels.find((l, i) => labels.indexOf(l) !== i);
  if (twice !== undefined) throw new FitInputError(`two candidates are called "${twice}": give each its own label`, "candidates");

  const fits = candidates.map((c, i): ModelFitResult => {
    try {
      return fitModel(c.model, { ...data, start: c.start, fixed: c.fixed, bounds: c.bounds } satisfies FitInput);
    } catch (err) {
      if (err instanceof FitInputError) throw new FitInputError(`candidate ${i + 1} (${labels[i]}): ${err.message}`, "candidates");
      throw err;
    }
  });
  const ranked: RankedCandidate[] = candidates.map((c, i) => ({
    label: labels[i],
    modelId: fits[i].modelId,
    fit: fits[i],
    k: fits[i].params.filter((p) => !p.fixed).length,
    deltaAic: NaN,
    deltaBic: NaN,
    akaikeWeight: NaN,
    eligible: fits[i].converged && fits[i].quality.level !== "not supported",
  }));
  const bestAic = Math.min(...ranked.map((r) => r.fit.aic));
  const bestBic = Math.min(...ranked.map((r) => r.fit.bic));
  let total = 0;
  for (const r of ranked) {
    r.deltaAic = r.fit.aic - bestAic;
    r.deltaBic = r.fit.bic - bestBic;
    total += Math.exp(-r.deltaAic / 2);
  }
  for (const r of ranked) r.akaikeWeight = Math.exp(-r.deltaAic / 2) / total;

  const tests: NestedTest[] = [];
  candidates.forEach((a, i) =>
    candidates.forEach((b, j) => {
      if (i !== j && nestedIn(a, b) && ranked[j].fit.dof > 0) tests.push(fTest(ranked[i], ranked[j]));
    }),
  );
  return { candidates: ranked, tests, ...choose(ranked, tests) };
}

function choose(ranked: RankedCandidate[], tests: NestedTest[]): { preferred: string | null; reason: string } {
  const converged = ranked.filter((r) => r.fit.converged);
  if (!converged.length) return { preferred: null, reason: "No candidate's fit converged: none can be preferred." };
  const eligible = ranked.filter((r) => r.eligible);
  const pool = eligible.length ? eligible : converged;
  const caveat = eligible.length ? "" : " Every converged fit was judged not supported by the data, so this is the least bad, not a good description.";
  const best = pool.reduce((a, b) => (b.fit.aic < a.fit.aic ? b : a));
  const runnerUp = pool.filter((r) => r !== best).reduce<RankedCandidate | null>((a, b) => (!a || b.fit.aic < a.fit.aic ? b : a), null);

  const simpler = tests
    .filter((t) => t.fuller === best.label && !t.rejectsSimpler)
    .map((t) => ({ t, r: pool.find((r) => r.label === t.simpler) }))
    .filter((s): s is { t: NestedTest; r: RankedCandidate } => Boolean(s.r) && s.r!.fit.aic - best.fit.aic < SUBSTANTIAL_SUPPORT)
    .sort((a, b) => a.r.k - b.r.k || a.r.fit.aic - b.r.fit.aic)[0];
  if (simpler) {
    return {
      preferred: simpler.r.label,
      reason:
        `${simpler.r.label}: ${best.label} has ${best.k - simpler.r.k} more free parameter${best.k - simpler.r.k === 1 ? "" : "s"} but lowers AIC by only ` +
        `${show(simpler.r.fit.aic - best.fit.aic, 2)} (below ${SUBSTANTIAL_SUPPORT}), and the F-test does not reject the simpler model ` +
        `(F = ${show(simpler.t.f)}, p = ${show(simpler.t.p, 2)}).${caveat}`,
    };
  }
  const margin = runnerUp ? `lowest AIC, ${show(runnerUp.fit.aic - best.fit.aic, 2)} below ${runnerUp.label}` : "the only candidate left";
  const nested = tests.filter((t) => t.fuller === best.label && t.rejectsSimpler);
  const because = nested.length ? `; the F-test rejects ${nested.map((t) => `${t.simpler} (p = ${show(t.p, 2)})`).join(" and ")}` : "";
  return { preferred: best.label, reason: `${best.label}: ${margin} (Akaike weight ${show(best.akaikeWeight, 2)})${because}.${caveat}` };
}
