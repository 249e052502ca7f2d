/**
 * Oscillation frequencies are bounded at the Nyquist frequency 1/(2Δt) and warned about near it:
 * samples every Δt cannot tell f from its alias 1/Δt − f, since cos(2π f k Δt + φ) =
 * cos(2π (1/Δt − f) k Δt − φ) for integer k (Shannon, Proc. IRE 37, 10 (1949); from memory).
 * Here Δt = 0.02 µs, so 1/Δt = 50 MHz and the Nyquist frequency is 25 MHz (by hand).
 */
import { describe, expect, it } from "vitest";
import { fitModel, getModel, type FitModel } from "@/lib/analysis";

const t = Array.from({ length: 101 }, (_, i) => 0.02 * i); // 0 … 2 µs
const noise = (i: number) => 0.004 * Math.sin(i * i * 0.7 + 1.3);
const ramsey = getModel("ramsey")!;
const ramsey14n = getModel("ramsey_14n")!;
const rabi = getModel("rabi")!;
const signal = (model: FitModel, p: number[]) => t.map((ti, i) => model.evaluate(ti, p) + noise(i));
const nyquist = (warnings: string[]) => warnings.filter((w) => w.includes("Nyquist"));

describe("Nyquist bound", () => {
  it("bounds δ and |A∥| of the Ramsey models and f of the Rabi model at 1/(2Δt) = 25 MHz, not 1/Δt = 50 MHz", () => {
    for (const [model, index] of [
      [ramsey, 3],
      [ramsey14n, 3],
      [ramsey14n, 4],
      [rabi, 3],
    ] as const) {
      const [lo, hi] = model.bounds!(t, t)[index];
      expect(lo).toBe(0);
      expect(hi).toBeCloseTo(25, 12);
    }
  });

  it("returns 20 MHz for fringes sampled at 30 MHz, the only one of the pair inside the bound", () => {
    // δ = 30 MHz and δ = 20 MHz with φ → −φ give the same samples on this grid.
    const r = fitModel("ramsey", { x: t, y: signal(ramsey, [0.5, 0.2, 1.5, 30, 0.4]) });
    expect(r.values.delta).toBeCloseTo(20, 2);
    expect(r.values.phi).toBeCloseTo(-0.4, 1);
  });
});

describe("Nyquist warnings", () => {
  it("says nothing for δ = 10 MHz, well inside the limit", () => {
    const r = fitModel("ramsey", { x: t, y: signal(ramsey, [0.5, 0.2, 1.5, 10, 0.4]) });
    expect(r.values.delta).toBeCloseTo(10, 2);
    expect(nyquist(r.warnings)).toEqual([]);
  });

  it("warns for δ = 23.5 MHz, within 10 % of 25 MHz, naming the alias 26.5 MHz", () => {
    const r = fitModel("ramsey", { x: t, y: signal(ramsey, [0.5, 0.2, 1.5, 23.5, 0.4]) });
    expect(r.values.delta).toBeCloseTo(23.5, 2);
    expect(nyquist(r.warnings)).toEqual([
      "δ = 23.5 is within 10 % of the Nyquist frequency 1/(2Δt) = 25 of these samples: a true δ of 1/Δt − δ = 26.5 would give the very same samples; sample more finely to tell them apart",
    ]);
  });

  it("warns for the outer ¹⁴N line δ + |A∥| = 24 MHz although δ = 20 and |A∥| = 4 MHz are both below 22.5", () => {
    const r = fitModel("ramsey_14n", { x: t, y: signal(ramsey14n, [0.5, 0.1, 1.5, 20, 4, 0.4]) });
    expect(r.values.delta).toBeCloseTo(20, 2);
    expect(r.values.Apar).toBeCloseTo(4, 2);
    expect(nyquist(r.warnings)).toHaveLength(1);
    expect(nyquist(r.warnings)[0]).toMatch(/^δ \+ \|A∥\| = 24 is within 10 % .* 1\/Δt − \(δ \+ \|A∥\|\) = 26 /);
  });

  it("warns for a Rabi frequency of 24 MHz", () => {
    const r = fitModel("rabi", { x: t, y: signal(rabi, [1, 0.1, 1.5, 24, 0.3]) });
    expect(r.values.f).toBeCloseTo(24, 2);
    expect(nyquist(r.warnings)).toHaveLength(1);
  });
});
