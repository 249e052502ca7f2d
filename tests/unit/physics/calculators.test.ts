import { describe, expect, it } from "vitest";
import { CalculatorInputError, ESTIMATE_CAUTION, UnknownCalculatorError, listCalculators, runCalculator } from "@/lib/physics/calculators";
import { hyperfineLines } from "@/lib/physics/odmr";
import { matchNucleus } from "@/lib/physics/larmor";

function inputError(fn: () => unknown): CalculatorInputError {
  try {
    fn();
  } catch (e) {
    if (e instanceof CalculatorInputError) return e;
    throw e;
  }
  throw new Error("expected a CalculatorInputError");
}

describe("calculator registry", () => {
  const calcs = listCalculators();

  it("has unique ids and every descriptor is complete", () => {
    expect(new Set(calcs.map((c) => c.id)).size).toBe(calcs.length);
    for (const c of calcs) {
      expect(c.title.length).toBeGreaterThan(0);
      expect(c.formula.length).toBeGreaterThan(0);
      expect(c.source.length).toBeGreaterThan(0);
      expect(c.inputs.length).toBeGreaterThan(0);
      expect(c.outputs.length).toBeGreaterThan(0);
      for (const f of [...c.inputs, ...c.outputs]) expect(f.unit.length).toBeGreaterThan(0);
    }
  });

  it("every calculator carries the shared caution", () => {
    expect(ESTIMATE_CAUTION).toBe("An estimate, not a calibration.");
    for (const c of calcs) expect(c.assumptions).toContain(ESTIMATE_CAUTION);
  });

  it("defaults are in range, run, and produce exactly the declared finite outputs", () => {
    for (const c of calcs) {
      const inputs = Object.fromEntries(c.inputs.map((i) => [i.name, i.default]));
      for (const i of c.inputs) expect(i.default, `${c.id}.${i.name}`).toBeDefined();
      const { outputs } = runCalculator(c.id, inputs);
      expect(Object.keys(outputs).sort(), c.id).toEqual(c.outputs.map((o) => o.name).sort());
      for (const v of Object.values(outputs)) expect(Number.isFinite(v), c.id).toBe(true);
    }
  });

  it("returns a copy of the list", () => {
    listCalculators().pop();
    expect(listCalculators().length).toBe(calcs.length);
  });
});

describe("runCalculator input validation", () => {
  it("rejects an unknown calculator", () => {
    expect(() => runCalculator("no-such-thing", {})).toThrow(UnknownCalculatorError);
  });

  it("names the missing field", () => {
    const e = inputError(() => runCalculator("odmr-field-from-pair", { f_minus: 2750 }));
    expect(e.field).toBe("f_plus");
    expect(e.message).toContain("required");
  });

  it("rejects non-numbers, NaN and infinities", () => {
    expect(inputError(() => runCalculator("proton-dipole-field", { d: "3", theta: 90 })).field).toBe("d");
    expect(inputError(() => runCalculator("proton-dipole-field", { d: NaN, theta: 90 })).field).toBe("d");
    expect(inputError(() => runCalculator("proton-dipole-field", { d: 3, theta: Infinity })).field).toBe("theta");
    expect(inputError(() => runCalculator("proton-dipole-field", { d: 3, theta: null })).field).toBe("theta");
  });

  it("enforces ranges, with exclusive minima for strictly positive quantities", () => {
    expect(inputError(() => runCalculator("proton-dipole-field", { d: 0, theta: 90 })).field).toBe("d");
    expect(inputError(() => runCalculator("proton-dipole-field", { d: -1, theta: 90 })).field).toBe("d");
    expect(inputError(() => runCalculator("proton-dipole-field", { d: 3, theta: 181 })).field).toBe("theta");
    expect(inputError(() => runCalculator("hahn-echo-sensitivity", { T2: 100, C: 1.5, T_total: 1 })).field).toBe("C");
    expect(runCalculator("proton-dipole-field", { d: 3, theta: 0 }).outputs.B).toBeGreaterThan(0); // inclusive min
    expect(runCalculator("charge-state-ratio", { A_minus: 0, A_zero: 1 }).outputs.ratio).toBe(0);
    expect(inputError(() => runCalculator("charge-state-ratio", { A_minus: 1, A_zero: 0 })).field).toBe("A_zero");
  });

  it("rejects unknown input names (typos)", () => {
    expect(inputError(() => runCalculator("nv-nmr-brms", { d: 10, rho: 67, density: 67 })).field).toBe("density");
  });

  it("checks relations between inputs", () => {
    expect(inputError(() => runCalculator("odmr-field-from-pair", { f_minus: 2990, f_plus: 2750 })).field).toBe("f_plus");
    expect(inputError(() => runCalculator("odmr-field-from-single-line", { f_minus: 2900, D: 2870 })).field).toBe("f_minus");
  });
});

describe("calculator warnings", () => {
  it("flags an off-axis/strained D from the pair of lines", () => {
    expect(runCalculator("odmr-field-from-pair", { f_minus: 2750, f_plus: 2990 }).warnings).toEqual([]);
    const w = runCalculator("odmr-field-from-pair", { f_minus: 2760, f_plus: 2990 }).warnings;
    expect(w.join(" ")).toMatch(/differs from 2870 MHz/);
  });

  it("always states the single-line validity limit and the alternative field", () => {
    const w = runCalculator("odmr-field-from-single-line", { f_minus: 2000, D: 2870 }).warnings.join(" ");
    expect(w).toContain("102.38 mT");
    // The other branch, B = (D + f₋)/γ_NV = 4870 MHz / 28.0317 MHz/mT = 173.73 mT (γ_NV = gμB/h with
    // g = 2.0028, Loubser & van Wyk 1978, from memory; CODATA 2018 μB and h).
    expect(w).toContain("173.73 mT");
  });

  it("warns near the m_s = 0/−1 crossing", () => {
    expect(runCalculator("odmr-resonances", { B: 50, D: 2870 }).warnings).toEqual([]);
    expect(runCalculator("odmr-resonances", { B: 110, D: 2870 }).warnings.length).toBe(1);
  });

  it("names the best-matching nucleus, or says none fits", () => {
    expect(runCalculator("nucleus-match", { f_peak: 4.2577, B: 100 }).warnings[0]).toContain("¹H");
    expect(runCalculator("nucleus-match", { f_peak: 20, B: 100 }).warnings[0]).toContain("No nucleus within 1 %");
  });
});

describe("helpers", () => {
  it("ranks nuclei by relative mismatch", () => {
    const ranked = matchNucleus(3.2125e6, 0.3);
    expect(ranked[0].nucleus).toBe("13C");
    for (let i = 1; i < ranked.length; i++) {
      expect(Math.abs(ranked[i].relativeMismatch)).toBeGreaterThanOrEqual(Math.abs(ranked[i - 1].relativeMismatch));
    }
    const out = runCalculator("nucleus-match", { f_peak: 3.2125, B: 300 }).outputs;
    expect(out.rank_13C).toBe(1);
    expect(out.mismatch_13C).toBeLessThan(1e-5);
  });

  it("places hyperfine lines: ¹⁴N triplet spaced |A∥|, ¹⁵N doublet spaced A∥ (Felton et al. 2009, from memory)", () => {
    expect(hyperfineLines(2870e6, "14N")).toEqual([2867.86e6, 2870e6, 2872.14e6]);
    const d = hyperfineLines(2870e6, "15N");
    expect(d[1] - d[0]).toBeCloseTo(3.03e6, 0);
  });
});
