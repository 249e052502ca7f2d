/**
 * A fit never reports a standard error the data cannot support. Data without any signal are
 * refused; an exact fit (no scatter) gives no errors rather than "± 0"; the shape parameters of an
 * amplitude that cannot be told from zero are reported as not determined, as is a parameter whose
 * error exceeds its whole allowed range. SciPy's curve_fit, for comparison, returns inf with an
 * OptimizeWarning in the degenerate cases, and "± 0" for the exact fit.
 */
import { describe, expect, it } from "vitest";
import { fitModel } from "@/lib/analysis";

const t = Array.from({ length: 30 }, (_, i) => 2 * i);

describe("data that cannot determine a curve are refused", () => {
  // SciPy 1.17.1: curve_fit(lambda t, S0, A, T1: S0 + A*np.exp(-t/T1), np.arange(30)*2.0, np.full(30, 0.5),
  //   p0=[0.5, 0.1, 15.9]) → T1 = 15.83, σ = [inf, inf, inf], "Covariance of the parameters could not be estimated".
  it("a y that never changes (before: T1 = 15.9 ± 0)", () => {
    expect(() => fitModel("relaxation", { x: t, y: t.map(() => 0.5) })).toThrow(
      expect.objectContaining({ name: "FitInputError", field: "y", message: "every y value is 0.5: there is no signal to fit" }),
    );
  });

  // SciPy 1.17.1: the same model on x = np.full(30, 3.0) → σ = [inf, inf, inf] with the same warning.
  it("an x that never changes", () => {
    expect(() => fitModel("relaxation", { x: t.map(() => 3), y: t.map((_, i) => 0.5 + 0.01 * Math.sin(i)) })).toThrow(
      expect.objectContaining({ name: "FitInputError", field: "x", message: "every x value is 3: a curve needs at least two different x values" }),
    );
  });
});

describe("an exact fit has no errors to report", () => {
  it("a line through collinear points: the values, but no ± 0", () => {
    // y = 1 + 2x exactly (hand-written); SciPy 1.17.1 curve_fit returns [1, 2] ± [0, 0] without a warning.
    const x = [0, 1, 2, 3, 4, 5];
    const r = fitModel("line", { x, y: x.map((v) => 1 + 2 * v) });
    expect(r.values.c0).toBeCloseTo(1, 12);
    expect(r.values.c1).toBeCloseTo(2, 12);
    expect(r.params.map((p) => p.stderr)).toEqual([NaN, NaN]);
    expect(r.undetermined).toEqual([true, true]);
    expect(r.warnings).toEqual(["not determined by the data: c0", "not determined by the data: c1"]);
    expect(r.verdicts[0]).toMatch(/^No scatter: the curve passes through every point/);
  });
});

describe("an amplitude that cannot be told from zero", () => {
  // t = 0 … 99, y = 0.5 + 0.0005·exp(−t/20) + 0.01·sin(0.7·i² + 1.3): a T1 decay buried in noise.
  // SciPy 1.17.1 (Python, same data):
  //   p, c = curve_fit(lambda t, S0, A, T1: S0 + A*np.exp(-t/T1), t, y, p0=[0.5, 0.0005, 20],
  //                    xtol=1e-15, ftol=1e-15, gtol=1e-15)
  //   p = [0.49957014512114334, 0.006403977541693661, 17.11718304633981]
  //   √diag(c) = [0.0012601462434842095, 0.0033689016378186587, 18.188200742854736], no warning
  // |A|/σ_A = 1.90: A cannot be told from zero at two standard errors, so "T1 = 17 ± 18" says nothing.
  const x = Array.from({ length: 100 }, (_, i) => i);
  const y = x.map((ti, i) => 0.5 + 0.0005 * Math.exp(-ti / 20) + 0.01 * Math.sin(0.7 * i * i + 1.3));
  const r = fitModel("relaxation", { x, y, start: { S0: 0.5, A: 0.0005, T1: 20 }, solver: { ftol: 1e-15, xtol: 1e-15, gtol: 1e-15 } });

  it("reaches SciPy's optimum and keeps the amplitude's own error", () => {
    const expected = [0.49957014512114334, 0.006403977541693661, 17.11718304633981];
    r.params.forEach((p, j) => expect(Math.abs(p.value - expected[j]) / expected[j], p.name).toBeLessThan(1e-6));
    expect(Math.abs(r.params[1].stderr - 0.0033689016378186587) / 0.0033689016378186587).toBeLessThan(1e-5);
    expect(Math.abs(r.params[0].stderr - 0.0012601462434842095) / 0.0012601462434842095).toBeLessThan(1e-5);
  });

  it("reports T1 as not determined, with the reason in words", () => {
    expect(r.params[2].stderr).toBeNaN();
    expect(r.undetermined).toEqual([false, false, true]);
    expect(r.covariance[2][2]).toBeNaN();
    expect(r.warnings).toContain("not determined by the data: T1");
    expect(r.verdicts).toEqual(["No clear signal: A = 0.0064 ± 0.00337 is within 2 standard errors of zero, so T1 is not determined by these data."]);
  });

  it("gives a derived quantity of an undetermined parameter no error (Rabi t_π from an invisible oscillation)", () => {
    // Rabi signal with amplitude 0.0005 under noise 0.01 (hand-made): f, τ and φ cannot be seen.
    const tr = Array.from({ length: 120 }, (_, i) => 0.01 * i);
    const yr = tr.map((ti, i) => 1 + 0.0005 * Math.cos(2 * Math.PI * 4.2 * ti) + 0.01 * Math.sin(0.7 * i * i + 1.3));
    const rabi = fitModel("rabi", { x: tr, y: yr });
    const a = rabi.params[1];
    expect(Math.abs(a.value)).toBeLessThan(2 * a.stderr);
    expect(rabi.params[3].stderr).toBeNaN();
    expect(rabi.derived.find((d) => d.name === "t_pi")!.stderr).toBeNaN();
  });
});

describe("an error wider than the allowed range", () => {
  it("an ODMR contrast (0 … 1) of an absent dip is not determined, and neither are its centre and width", () => {
    // Flat PL with noise only (hand-made): there is no dip to fit.
    const f = Array.from({ length: 30 }, (_, i) => 2800 + 2 * i);
    let s = 1;
    const y = f.map(() => {
      s = (s * 16807) % 2147483647;
      return 0.5 + 0.01 * (s / 2147483647 - 0.5);
    });
    const r = fitModel("odmr_lorentzian_1", { x: f, y });
    for (const name of ["f1", "w1", "c1"]) expect(r.params.find((p) => p.name === name)!.stderr, name).toBeNaN();
    expect(r.params[0].stderr).toBeGreaterThan(0);
    expect(r.verdicts.some((v) => v.startsWith("c1: its standard error exceeds the whole range allowed for it"))).toBe(true);
  });
});
