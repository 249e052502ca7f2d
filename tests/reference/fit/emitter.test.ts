// PL saturation and g⁽²⁾ antibunching against an independent fit: SciPy 1.17.1
// scipy.optimize.curve_fit on the same data (generators below, written identically in Python),
// unweighted, covariance scaled by χ²ᵣ (absolute_sigma=False), xtol = ftol = gtol = 1e-15. SciPy's
// output is pasted as literals; derived values and their errors (gᵀ·C·g with SciPy's covariance)
// were computed in Python from it.
import { describe, expect, it } from "vitest";
import { fitModel } from "@/lib/analysis/fit-model";

function expectRel(actual: number, expected: number, tol: number, label: string) {
  expect(Math.abs(actual - expected) / Math.abs(expected), `${label}: got ${actual}, expected ${expected}`).toBeLessThanOrEqual(tol);
}
const wobble = (i: number) => Math.sin(i * i * 0.7 + 1.3);
const tight = { ftol: 1e-15, xtol: 1e-15, gtol: 1e-15 };

describe("PL saturation", () => {
  // P = 0.05 + 0.05·i mW, i = 0 … 39; I = 180·P/(P + 0.9) + 6·P + 1.5·sin(0.7·i² + 1.3) kcps.
  const P = Array.from({ length: 40 }, (_, i) => 0.05 + 0.05 * i);
  const I = P.map((p, i) => (180 * p) / (p + 0.9) + 6 * p + 1.5 * wobble(i));

  it("parameters within 1e-5 standard errors of SciPy's and errors to 1e-5; the count rate at P_sat with its propagated error", () => {
    const r = fitModel("pl_saturation", { x: P, y: I, solver: tight });
    // scipy 1.17.1: curve_fit(sat, P, y, p0=[150, 1.0, 3.0])
    const values = [186.7225076928623, 0.9143558727485938, 3.6919068587605364];
    const errors = [11.5954370297076, 0.0606159131031763, 2.841568685432109];
    // b is barely determined (σ_b/b ≈ 0.8), so the optimum is flat along it: compare in units of σ.
    r.params.forEach((p, j) => {
      expect(Math.abs(p.value - values[j]!) / errors[j]!, p.name).toBeLessThanOrEqual(1e-5);
      expectRel(p.stderr, errors[j]!, 1e-5, `σ(${p.name})`);
    });
    expect(r.derived.map((d) => d.name)).toEqual(["I_at_Psat"]);
    expectRel(r.derived[0]!.value, 96.73697056437966, 1e-6, "I(P_sat)");
    expectRel(r.derived[0]!.stderr, 3.4568374225113665, 1e-5, "σ(I(P_sat))");
  });

  it("finds the same optimum from its own start values", () => {
    expectRel(fitModel("pl_saturation", { x: P, y: I }).values.Psat!, 0.9143558727485938, 1e-6, "P_sat");
  });

  it("holds the background at zero when asked", () => {
    const r = fitModel("pl_saturation", { x: P, y: I, fixed: { b: 0 } });
    expect(r.params[2]).toMatchObject({ value: 0, stderr: 0, fixed: true });
  });
});

describe("g⁽²⁾ antibunching, three-level", () => {
  // τ = −40 + 0.5·j ns, j = 0 … 160; g2 = model(β 0.78, a 0.35, τ₀ 0.4, τ₁ 6, τ₂ 80) + 0.03·sin(0.7·j² + 1.3).
  const tau = Array.from({ length: 161 }, (_, j) => -40 + 0.5 * j);
  const g2 = (t: number) => {
    const u = Math.abs(t - 0.4);
    return 1 - 0.78 * (1.35 * Math.exp(-u / 6) - 0.35 * Math.exp(-u / 80));
  };
  const y = tau.map((t, j) => g2(t) + 0.03 * wobble(j));

  it("parameters to 1e-6 and errors to 1e-4 of SciPy; g⁽²⁾(0) = 1 − β with σ_β, and a single-emitter verdict", () => {
    const r = fitModel("g2_antibunching", { x: tau, y, solver: tight });
    // scipy 1.17.1: curve_fit(g2, tau, y2, p0=[0.7, 0.3, 0.0, 5.0, 60.0])
    const values = [0.7734096280673551, 0.3344659154579822, 0.36497555139807975, 5.99104095390754, 98.82310467810152];
    const errors = [0.01048320930225768, 0.0300193943495571, 0.03848334672722131, 0.2121306411339758, 24.96476065064367];
    r.params.forEach((p, j) => {
      expectRel(p.value, values[j]!, 1e-6, p.name);
      expectRel(p.stderr, errors[j]!, 1e-4, `σ(${p.name})`);
    });
    expectRel(r.derived[0]!.value, 0.22659037193264486, 1e-6, "g2(0)");
    expectRel(r.derived[0]!.stderr, 0.01048320930225768, 1e-4, "σ(g2(0))");
    // (0.5 − 0.22659)/0.010483 = 26.08 standard errors.
    expect(r.verdicts).toEqual(["Single emitter: g⁽²⁾(0) is 26.1 standard errors below 0.5."]);
  });

  it("a shallow dip is not called a single emitter", () => {
    const shallow = tau.map((t, j) => 1 - 0.4 * Math.exp(-Math.abs(t - 0.4) / 6) + 0.03 * wobble(j));
    // Without bunching (a = 0) τ₂ has no effect, so it is held too.
    const r = fitModel("g2_antibunching", { x: tau, y: shallow, fixed: { a: 0, tau2: 80 } });
    expect(r.verdicts[0]).toMatch(/^Not a single emitter: g⁽²⁾\(0\) is not below 0\.5 \(\d+\.\d standard errors above\)\.$/);
  });
});
