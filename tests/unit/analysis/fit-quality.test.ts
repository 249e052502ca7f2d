/**
 * "Converged" is not "good": every fit is judged, and a fit that converged onto the wrong thing
 * says so. The cases are seeded synthetic data (seeded-random.ts) and the demo ODMR file; the
 * statistics themselves are checked against NumPy/SciPy in
 * tests/reference/stats/residual-structure.reference.test.ts. Thresholds: residual structure at
 * p < 0.01 (runs test, Wald & Wolfowitz, Ann. Math. Stat. 11, 147 (1940); Durbin–Watson, Biometrika
 * 37, 409 (1950)), χ²ᵣ outside its 99 % interval when σ is given, a bound within 1e-4 of the range,
 * |A∥| of ¹⁴N within 1.5–3 MHz and of ¹⁵N within 2.5–3.5 MHz.
 */
import { describe, expect, it } from "vitest";
import { fitModel } from "@/lib/analysis";
import { BOUND_TOLERANCE, CHI2_LEVEL, RESIDUAL_P } from "@/lib/analysis/fit-quality";
import { reducedChiSquareInterval } from "@/lib/analysis/stats/chi-square";
import { parseTable } from "@/lib/data/parse";
import { demoFiles } from "@/lib/demo-data";
import { odmrFiles } from "@/lib/demo-data/odmr";
import { odmrResonances } from "@/lib/physics/odmr";
import { linspace, seededRandom, synthesize } from "./seeded-random";

/** Normalised CW-ODMR: Lorentzian dips of FWHM 1 MHz and contrast 3 % at each line, noise 0.0035 (as the demo's 4.2 mT file). */
function odmrSweep(lines: number[], x: number[], seed: number): number[] {
  const random = seededRandom(seed);
  return x.map((f) => 1 - lines.reduce((s, c) => s + 0.03 / (1 + (2 * (f - c)) ** 2), 0) + 0.0035 * random.normal());
}

/** f₋ and f₊ at 4.2 mT along the NV axis (lib/physics/odmr), each a ¹⁴N triplet spaced 2.16 MHz, in MHz. */
function twoGroupLines(): number[] {
  const { fMinus, fPlus } = odmrResonances(4.2e-3);
  return [fMinus / 1e6, fPlus / 1e6].flatMap((f) => [f - 2.16, f, f + 2.16]);
}

const checks = (r: ReturnType<typeof fitModel>) => r.quality.findings.map((f) => f.check);

describe("the ¹⁴N-triplet model on a two-group sweep (f₋ and f₊ at 4.2 mT) is not good", () => {
  it("the demo file: A∥ = 117.7 MHz at R² = 0.29 under a converged solver is now not supported", () => {
    const file = odmrFiles().find((f) => f.fileName.includes("4p2mT"))!;
    const table = parseTable(new TextEncoder().encode(file.content), { fileName: file.fileName });
    const x = table.data[0] as Float64Array;
    const y = table.data[1] as Float64Array;
    expect(table.columns[0].unit).toBe("MHz");
    const r = fitModel("odmr_14n_triplet", { x, y, xUnit: table.columns[0].unit });
    // The case as reported: the solver converges onto the outer lines f₋ and f₊ with f0 between them.
    expect(r.converged).toBe(true);
    expect(r.values.Apar).toBeCloseTo(117.7, 1);
    expect(r.r2).toBeCloseTo(0.29, 2);
    expect(r.quality.level).toBe("not supported");
    expect(checks(r)).toEqual(expect.arrayContaining(["physical-range", "shape", "residual-runs", "residual-durbin-watson"]));
    expect(r.quality.findings.find((f) => f.check === "physical-range")!.message).toBe(
      "|Apar| = 118 MHz is outside 1.5–3 MHz, the range of the ¹⁴N hyperfine splitting |A∥| of the NV centre: the model has matched something else in the data.",
    );
    expect(r.quality.suggestion).toMatchObject({ modelId: "odmr_14n_two_groups", title: "ODMR, f₋ and f₊ with ¹⁴N hyperfine triplets" });
    expect(r.quality.runs!.p).toBeLessThan(RESIDUAL_P);
  });

  it("a seeded sweep: out of range, the two groups named and the f₋/f₊ model suggested", () => {
    const x = linspace(2700, 3050, 2000);
    const r = fitModel("odmr_14n_triplet", { x, y: odmrSweep(twoGroupLines(), x, 13), xUnit: "MHz" });
    expect(r.converged).toBe(true);
    expect(r.values.Apar).toBeGreaterThan(3);
    expect(r.quality.level).toBe("not supported");
    expect(checks(r)).toEqual(expect.arrayContaining(["physical-range", "shape"]));
    const shape = r.quality.findings.find((f) => f.check === "shape")!;
    expect(shape.message).toMatch(/^The model does not fit the data's shape: the data show 2 separate groups of dips \(near 2752\.\d and 2987\.\d\)/);
    expect(shape.message).toMatch(/Try “ODMR, f₋ and f₊ with ¹⁴N hyperfine triplets”\.$/);
  });

  it("without the x unit the range cannot be checked, but the shape still fails the fit", () => {
    const x = linspace(2700, 3050, 2000);
    const r = fitModel("odmr_14n_triplet", { x, y: odmrSweep(twoGroupLines(), x, 13) });
    expect(checks(r)).not.toContain("physical-range");
    expect(r.quality.level).toBe("not supported");
  });

  it("the suggested two-resonance model is not flagged for its shape, but keeps the unresolved hyperfine lines as residual structure", () => {
    const x = linspace(2700, 3050, 2000);
    const r = fitModel("odmr_two_resonances", { x, y: odmrSweep(twoGroupLines(), x, 13), xUnit: "MHz" });
    expect(r.quality.suggestion).toBeUndefined();
    expect(checks(r)).not.toContain("shape");
    // One Lorentzian per group cannot take the three ¹⁴N lines inside it: neighbouring residuals alike.
    expect(r.quality.level).toBe("questionable");
    expect(checks(r)).toContain("residual-durbin-watson");
  });
});

describe("right models on seeded data are good", () => {
  it("the ¹⁴N triplet on one group, σ given: |A∥| in range, no structure, χ²ᵣ inside its 99 % interval", () => {
    const x = linspace(2740, 2765, 400);
    const lines = twoGroupLines().slice(0, 3);
    const r = fitModel("odmr_14n_triplet", { x, y: odmrSweep(lines, x, 7), sigma: x.map(() => 0.0035), xUnit: "MHz" });
    expect(r.values.Apar).toBeCloseTo(2.16, 1);
    expect(r.quality.findings).toEqual([]);
    expect(r.quality.level).toBe("good");
    expect(r.quality.chi2Interval).toEqual(reducedChiSquareInterval(r.dof, CHI2_LEVEL));
    expect(r.quality.runs!.p).toBeGreaterThan(RESIDUAL_P);
    expect(r.quality.durbinWatson!.p).toBeGreaterThan(RESIDUAL_P);
  });

  it("the same sweep with x in GHz: |A∥| is converted to MHz before the range check", () => {
    const x = linspace(2740, 2765, 400);
    const y = odmrSweep(twoGroupLines().slice(0, 3), x, 7);
    const r = fitModel("odmr_14n_triplet", { x: x.map((f) => f / 1000), y, xUnit: "GHz" });
    expect(r.values.Apar).toBeCloseTo(0.00216, 4);
    expect(checks(r)).not.toContain("physical-range");
    expect(r.quality.level).toBe("good");
  });

  it("a Hahn echo (S0 = 0.1, A = 1, T₂ = 40, n = 2, noise 0.01 given as σ) is good", () => {
    const x = linspace(0, 150, 120);
    const y = synthesize((t, p) => p[0] + p[1] * Math.exp(-((t / p[2]) ** p[3])), [0.1, 1, 40, 2], x, 0.01, seededRandom(3));
    const r = fitModel("hahn_echo", { x, y, sigma: x.map(() => 0.01), xUnit: "µs" });
    expect(r.quality.level).toBe("good");
    expect(r.quality.summary).toMatch(/^the fit describes the data/);
  });

  it("unsorted x gives the same judgement as sorted x: the residuals are tested in order of x", () => {
    const x = linspace(0, 150, 120);
    const y = synthesize((t, p) => p[0] + p[1] * Math.exp(-((t / p[2]) ** p[3])), [0.1, 1, 40, 2], x, 0.01, seededRandom(3));
    const random = seededRandom(99);
    const order = x
      .map((_, i) => [random.uniform(), i])
      .sort((a, b) => a[0] - b[0])
      .map(([, i]) => i);
    const sorted = fitModel("hahn_echo", { x, y });
    const shuffled = fitModel("hahn_echo", { x: order.map((i) => x[i]), y: order.map((i) => y[i]) });
    expect(shuffled.quality.runs).toEqual(sorted.quality.runs);
    expect(shuffled.quality.durbinWatson!.d).toBeCloseTo(sorted.quality.durbinWatson!.d, 8);
  });
});

describe("each check on its own", () => {
  const x = linspace(0, 150, 120);
  const echo = (noise: number, seed: number) =>
    synthesize((t, p) => p[0] + p[1] * Math.exp(-((t / p[2]) ** p[3])), [0.1, 1, 40, 2], x, noise, seededRandom(seed));

  it("σ half the true scatter: χ²ᵣ above its 99 % interval", () => {
    const r = fitModel("hahn_echo", { x, y: echo(0.02, 5), sigma: x.map(() => 0.01) });
    expect(r.dof).toBe(116);
    // SciPy 1.17.1: chi2.ppf(0.005, 116)/116 = 0.6941564027143303, chi2.ppf(0.995, 116)/116 = 1.370492651272906
    expect(r.quality.chi2Interval![0]).toBeCloseTo(0.6941564027143303, 10);
    expect(r.quality.chi2Interval![1]).toBeCloseTo(1.370492651272906, 10);
    expect(r.chi2red).toBeGreaterThan(r.quality.chi2Interval![1]);
    expect(checks(r)).toEqual(["chi2"]);
    expect(r.quality.level).toBe("questionable");
    expect(r.quality.findings[0].message).toMatch(/^χ²ᵣ = 3\.\d+ is above the 99 % interval 0\.694–1\.37 for 116 degrees of freedom/);
  });

  it("σ twice the true scatter: χ²ᵣ below its interval", () => {
    const r = fitModel("hahn_echo", { x, y: echo(0.005, 5), sigma: x.map(() => 0.01) });
    expect(r.chi2red).toBeLessThan(r.quality.chi2Interval![0]);
    expect(checks(r)).toEqual(["chi2"]);
  });

  it("without σ, χ²ᵣ is the scatter itself and is not judged", () => {
    const r = fitModel("hahn_echo", { x, y: echo(0.02, 5) });
    expect(r.quality.chi2Interval).toBeUndefined();
    expect(r.quality.level).toBe("good");
  });

  it("a line through an exponential decay leaves structure in the residuals", () => {
    const t = linspace(0, 100, 80);
    const y = synthesize((v) => 0.2 + Math.exp(-v / 25), [], t, 0.01, seededRandom(11));
    const r = fitModel("line", { x: t, y });
    expect(r.converged).toBe(true);
    expect(r.quality.runs!.z).toBeLessThan(0);
    expect(checks(r)).toEqual(expect.arrayContaining(["residual-runs", "residual-durbin-watson"]));
    expect(r.quality.level).toBe("questionable");
  });

  it("a stretch exponent held below its fitted value stops at the bound", () => {
    // n = 2 in the data; the range 0.5–1.5 leaves the best n outside.
    const r = fitModel("hahn_echo", { x, y: echo(0.01, 3), bounds: { n: [0.5, 1.5] } });
    expect(r.values.n).toBeGreaterThan(1.5 - BOUND_TOLERANCE);
    expect(checks(r)).toContain("bound");
    expect(r.quality.findings.find((f) => f.check === "bound")!.message).toMatch(/^n = 1\.5 stopped at its bound \[0\.5, 1\.5\]/);
    expect(r.quality.level).toBe("questionable");
  });

  it("a value far inside a very wide range is not at its bound (the demo echo NV01: T₂ ≈ 39 µs in 0.002 µs – 2 s)", () => {
    const file = demoFiles().find((f) => f.fileName === "echo_K17-NV01.csv");
    const table = parseTable(new TextEncoder().encode(file!.content), { fileName: file!.fileName });
    const [t, signal, sigma] = table.data as Float64Array[];
    const r = fitModel("hahn_echo", { x: t, y: signal, sigma, xUnit: table.columns[0].unit });
    expect(r.params.find((p) => p.name === "T2")!.bounds[1]).toBeGreaterThan(1e6);
    expect(checks(r)).not.toContain("bound");
    expect(r.quality.level).toBe("good");
  });

  it("a solver stopped before converging is not supported", () => {
    const r = fitModel("hahn_echo", { x, y: echo(0.01, 3), maxIterations: 1 });
    expect(r.converged).toBe(false);
    expect(r.quality.level).toBe("not supported");
    expect(checks(r)).toContain("convergence");
  });

  it("a ¹⁵N doublet fitted to one ¹⁴N triplet: |A∥| outside 2.5–3.5 MHz", () => {
    const f0 = 2752.27;
    const xs = linspace(f0 - 12, f0 + 12, 400);
    const r = fitModel("odmr_15n_doublet", { x: xs, y: odmrSweep([f0 - 2.16, f0, f0 + 2.16], xs, 21), xUnit: "MHz" });
    expect(checks(r)).toContain("physical-range");
    expect(r.quality.level).toBe("not supported");
  });
});
