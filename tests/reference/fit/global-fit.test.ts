/**
 * Global fits against independent computations: with nothing shared they equal the separate fits;
 * with S₀ and A shared they equal a stacked SciPy fit of all three curves at once.
 */
import { describe, expect, it } from "vitest";
import { fitModel } from "@/lib/analysis";
import { globalFit, type GlobalDataset } from "@/lib/analysis/global-fit";

const T1S = [2, 4, 8];
/** Three T1 curves (ms) sharing S₀ = 0.7 and A = 0.3, with a hand-made wobble in place of noise. */
const CURVES: Array<GlobalDataset & { x: number[]; y: number[] }> = T1S.map((t1, k) => {
  const x = Array.from({ length: 30 }, (_, i) => 0.05 * 1.25 ** i);
  const y = x.map((t, i) => Number((0.7 + 0.3 * Math.exp(-t / t1) + 0.002 * Math.sin(7 * i + k)).toFixed(5)));
  return { label: `T1 = ${t1} ms`, x, y };
});

/*
 * SciPy 1.17.1, stacked fit of the same three curves (x and y concatenated, I = curve index):
 *   def f(xx, s0, a, t1a, t1b, t1c): return s0 + a*np.exp(-xx/np.array([t1a, t1b, t1c])[I])
 *   p, c = curve_fit(f, X, Y, p0=[0.7, 0.3, 2, 4, 8], method="lm", ftol=1e-14, xtol=1e-14, gtol=1e-14)
 * and with sigma = 0.002 on the first two curves, 0.004 on the third, absolute_sigma=True.
 */
const SCIPY = {
  values: [0.7004107211442568, 0.29977166457220555, 1.9933856409743633, 3.9826582336700467, 7.974855264261967],
  stderr: [0.0003811787874184697, 0.0004226352627112389, 0.011204827983785675, 0.02243500160345983, 0.04480026826958209],
  chi2: 0.00017713573462865013,
  weightedValues: [0.7004250129594437, 0.2998531091875219, 1.9919757912284273, 3.9797994760792164, 7.969056019651628],
  weightedStderr: [0.0005556720855296775, 0.0006477213772274209, 0.016083462493347023, 0.03222925531418165, 0.10824804959576681],
};

const relative = (a: number, b: number) => Math.abs(a / b - 1);

describe("global fit", () => {
  it("with nothing shared equals the separate fits (values and unscaled errors)", () => {
    const joint = globalFit("relaxation", { datasets: CURVES, shared: [] });
    expect(joint.converged).toBe(true);
    CURVES.forEach((curve, k) => {
      const alone = fitModel("relaxation", { x: curve.x, y: curve.y });
      for (const [j, p] of alone.params.entries()) {
        const q = joint.params.find((g) => g.name === p.name && g.dataset === k)!;
        expect(relative(q.value, p.value), `${p.name} of ${curve.label}`).toBeLessThan(1e-7);
        expect(relative(q.stderrUnscaled, alone.stderrUnscaled[j]), `σ of ${p.name} of ${curve.label}`).toBeLessThan(1e-5);
      }
      expect(relative(joint.datasets[k].chi2, alone.chi2)).toBeLessThan(1e-6);
    });
    // The block-diagonal covariance: no correlation between different datasets' parameters.
    const a = joint.params.findIndex((g) => g.name === "T1" && g.dataset === 0);
    const b = joint.params.findIndex((g) => g.name === "T1" && g.dataset === 1);
    expect(Math.abs(joint.correlation[a][b])).toBeLessThan(1e-8);
  });

  it("with nothing shared and n held at 2, echo curves (the swept Jacobian) equal their separate fits", () => {
    const echoes = [60, 120].map((t2, k) => {
      const x = Array.from({ length: 80 }, (_, i) => 2 + 4 * i);
      return { label: `T2 = ${t2} µs`, x, y: x.map((t, i) => 0.5 + 0.3 * Math.exp(-((t / t2) ** 2)) + 0.003 * Math.sin(5 * i + k)) };
    });
    const joint = globalFit("hahn_echo", { datasets: echoes, shared: [], fixed: { n: 2 } });
    echoes.forEach((curve, k) => {
      const alone = fitModel("hahn_echo", { x: curve.x, y: curve.y, fixed: { n: 2 } });
      for (const p of alone.params.filter((q) => !q.fixed)) {
        const q = joint.params.find((g) => g.name === p.name && g.dataset === k)!;
        expect(relative(q.value, p.value), `${p.name} of ${curve.label}`).toBeLessThan(1e-7);
      }
      expect(joint.datasets[k].values.n).toBe(2);
      expect(joint.datasets[k].stderr.n).toBe(0);
    });
  });

  it("with S₀ and A shared equals SciPy's stacked fit (values 1e-7, errors 1e-5)", () => {
    const joint = globalFit("relaxation", { datasets: CURVES, shared: ["S0", "A"] });
    expect(joint.converged).toBe(true);
    expect(joint.params.map((p) => `${p.name}:${p.dataset}`)).toEqual(["S0:null", "A:null", "T1:0", "T1:1", "T1:2"]);
    joint.params.forEach((p, q) => {
      expect(relative(p.value, SCIPY.values[q]), `${p.name}:${p.dataset}`).toBeLessThan(1e-7);
      expect(relative(p.stderr, SCIPY.stderr[q]), `σ ${p.name}:${p.dataset}`).toBeLessThan(1e-5);
    });
    expect(relative(joint.chi2, SCIPY.chi2)).toBeLessThan(1e-7);
    expect(joint.dof).toBe(90 - 5);
    expect(joint.datasets[2].values).toMatchObject({ S0: joint.params[0].value, A: joint.params[1].value, T1: joint.params[4].value });
  });

  it("weights each dataset by its own σ, as SciPy with absolute_sigma", () => {
    const weighted = CURVES.map((c, k) => ({ ...c, sigma: c.x.map(() => (k === 2 ? 0.004 : 0.002)) }));
    const joint = globalFit("relaxation", { datasets: weighted, shared: ["S0", "A"] });
    joint.params.forEach((p, q) => {
      expect(relative(p.value, SCIPY.weightedValues[q]), `${p.name}:${p.dataset}`).toBeLessThan(1e-7);
      expect(relative(p.stderrUnscaled, SCIPY.weightedStderr[q]), `σ ${p.name}:${p.dataset}`).toBeLessThan(1e-5);
    });
  });

  it("says when one dataset does not fit the shared values", () => {
    // The third curve has another baseline (0.6): sharing S₀ forces a compromise it fits badly.
    const odd = CURVES.map((c, k) => (k === 2 ? { ...c, label: "shifted", y: c.y.map((v) => v - 0.1) } : c));
    const joint = globalFit("relaxation", { datasets: odd, shared: ["S0", "A"] });
    expect(joint.warnings.some((w) => /^shifted fits .*× worse per point than the median dataset/.test(w))).toBe(true);
  });

  it("refuses what it cannot fit, naming the field", () => {
    expect(() => globalFit("relaxation", { datasets: CURVES.slice(0, 1), shared: [] })).toThrow("at least two datasets");
    expect(() => globalFit("relaxation", { datasets: CURVES, shared: ["T9"] })).toThrow('unknown parameter "T9"');
    expect(() => globalFit("relaxation", { datasets: CURVES, shared: ["A"], fixed: { A: 0.3 } })).toThrow('"A" is held fixed, so it cannot also be shared');
    const bad = [CURVES[0], { ...CURVES[1], y: CURVES[1].y.slice(1) }];
    expect(() => globalFit("relaxation", { datasets: bad, shared: [] })).toThrow("dataset 2 (T1 = 4 ms): y has 29 values but x has 30");
  });
});
