// Rabi models (exponential and Gaussian damping) against an independent fit: SciPy 1.17.1
// scipy.optimize.curve_fit on the same data (the generator below, written out identically in
// Python), default unweighted least squares, covariance scaled by χ²ᵣ (absolute_sigma=False),
// xtol = ftol = gtol = 1e-15. Expected values are SciPy's output, pasted as literals; the derived
// pulse lengths are 1/(2f), 1/(4f) with σ = σ_f/(2f²), σ_f/(4f²), computed in Python from SciPy's f.
import { describe, expect, it } from "vitest";
import { fitModel } from "@/lib/analysis/fit-model";

// t = 0.01·i µs, i = 0 … 119; noise 0.004·sin(0.7·i² + 1.3) (deterministic, so both sides see the same data).
const t = Array.from({ length: 120 }, (_, i) => 0.01 * i);
const noise = (i: number) => 0.004 * Math.sin(i * i * 0.7 + 1.3);
const signal = (damp: (t: number) => number) => t.map((ti, i) => 1.0 + 0.12 * damp(ti) * Math.cos(2 * Math.PI * 4.2 * ti + 0.3) + noise(i));

function expectRel(actual: number, expected: number, tol: number, label: string) {
  expect(Math.abs(actual - expected) / Math.abs(expected), `${label}: got ${actual}, expected ${expected}`).toBeLessThanOrEqual(tol);
}

const cases = [
  {
    model: "rabi",
    y: signal((ti) => Math.exp(-ti / 0.8)),
    // scipy 1.17.1: curve_fit(rabi, t, y, p0=[1.0, 0.1, 0.7, 4.0, 0.2])
    values: [1.0002153570656354, 0.1206423988174472, 0.7809409518424947, 4.197422976731306, 0.30100020060088395],
    stderr: [0.00027874988198546286, 0.0010845925049445995, 0.012497882214071129, 0.003306345898130566, 0.008887679634220661],
    tPi: [0.11912070877102053, 9.38323988339576e-5],
    tPiHalf: [0.059560354385510265, 4.69161994169788e-5],
  },
  {
    model: "rabi_gaussian",
    y: signal((ti) => Math.exp(-((ti / 0.9) ** 2))),
    // scipy 1.17.1: curve_fit(rabig, t, y, p0=[1.0, 0.1, 0.7, 4.0, 0.2])
    values: [1.000207133777083, 0.12012031932560478, 0.8895127483911677, 4.198407080472599, 0.30027878290055116],
    stderr: [0.00027808850562065224, 0.0007240734527969394, 0.006852935743700224, 0.0029649338081669894, 0.007956912623231959],
    tPi: [0.11909278695855212, 8.410385739023966e-5],
    tPiHalf: [0.05954639347927606, 4.205192869511983e-5],
  },
];

describe("Rabi oscillation fits agree with SciPy", () => {
  for (const c of cases)
    it(`${c.model}: parameters to 1e-7, errors to 1e-5, π and π/2 pulse lengths with propagated errors`, () => {
      const r = fitModel(c.model, { x: t, y: c.y, solver: { ftol: 1e-15, xtol: 1e-15, gtol: 1e-15 } });
      expect(r.converged).toBe(true);
      r.params.forEach((p, j) => {
        expectRel(p.value, c.values[j]!, 1e-7, p.name);
        expectRel(p.stderr, c.stderr[j]!, 1e-5, `σ(${p.name})`);
      });
      const [tPi, tPiHalf] = r.derived;
      expect([tPi!.name, tPi!.unit, tPiHalf!.name]).toEqual(["t_pi", "x", "t_pi_half"]);
      expectRel(tPi!.value, c.tPi[0]!, 1e-7, "t_π");
      expectRel(tPi!.stderr, c.tPi[1]!, 1e-5, "σ(t_π)");
      expectRel(tPiHalf!.value, c.tPiHalf[0]!, 1e-7, "t_π/2");
      expectRel(tPiHalf!.stderr, c.tPiHalf[1]!, 1e-5, "σ(t_π/2)");
    });

  it("finds the oscillation from its own start values (no hand-given start)", () => {
    const r = fitModel("rabi", { x: t, y: cases[0]!.y });
    expectRel(r.values.f!, 4.197422976731306, 1e-6, "f");
  });
});
