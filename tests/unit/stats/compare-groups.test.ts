import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { brownForsythe, compareGroups, mannWhitneyExactDistribution, mannWhitneyU } from "@/lib/analysis/stats";

const group = fc.array(fc.integer({ min: -50, max: 50 }), { minLength: 3, maxLength: 25 });

// Equal up to rounding. The statistics are dimensionless, so near zero (equal means give t ≈ ±1e-17)
// an absolute floor is the right tolerance; a purely relative one fails on rounding noise.
const same = (x: number, y: number) => (Number.isNaN(x) && Number.isNaN(y)) || Math.abs(x - y) <= 1e-9 * (1 + Math.abs(x));

describe("compareGroups() edge cases", () => {
  it("returns NaN with notes for groups too small, never throws", () => {
    const r = compareGroups([1], [2, 3, 4]);
    expect(r.welch.t).toBeNaN();
    expect(r.welch.notes[0]).toMatch(/at least 2/);
    expect(r.brownForsythe.F).toBeNaN();
    expect(r.brownForsythe.notes[0]).toMatch(/at least 2/);
    expect(r.mannWhitney.method).toBe("exact"); // n = 1 is still a valid rank test
    expect(r.mannWhitney.U).toBe(0);
    expect(r.mannWhitney.p).toBeCloseTo(0.5, 12); // P(U ≤ 0) = 1/4, two-sided 1/2

    const empty = compareGroups([], []);
    expect(empty.mannWhitney.p).toBeNaN();
    expect(empty.mannWhitney.notes[0]).toMatch(/at least 1/);
  });

  it("handles zero variance and all-equal data", () => {
    const r = compareGroups([2, 2, 2], [2, 2, 2]);
    expect(r.welch.t).toBeNaN();
    expect(r.welch.notes[0]).toMatch(/zero variance/);
    expect(r.mannWhitney.p).toBe(1);
    expect(r.brownForsythe.F).toBeNaN();
  });

  it("drops non-finite values with a note", () => {
    const r = compareGroups([1, 2, NaN, 3], [4, 5, Infinity, 6]);
    expect([r.nA, r.nB]).toEqual([3, 3]);
    expect(r.notes).toHaveLength(2);
  });

  it("chooses exact or normal-approximation Mann–Whitney as documented", () => {
    expect(mannWhitneyU([1, 2, 3], [4, 5, 6]).method).toBe("exact");
    expect(mannWhitneyU([1, 2, 3], [3, 5, 6]).method).toBe("normal-approximation"); // tie
    const big = Array.from({ length: 50 }, (_, i) => i);
    expect(
      mannWhitneyU(
        big,
        big.map((v) => v + 0.5),
      ).method,
    ).toBe("normal-approximation"); // n ≥ 50
  });

  it("perfect separation with 3 + 3 values gives exact p = 2/20", () => {
    const r = mannWhitneyU([1, 2, 3], [4, 5, 6]);
    expect(r.U).toBe(0);
    expect(r.p).toBeCloseTo(0.1, 14); // 2 · 1/C(6,3)
  });
});

describe("exact Mann–Whitney distribution", () => {
  it("sums to 1, is symmetric, and has the right mean", () => {
    for (const [m, n] of [
      [1, 1],
      [3, 4],
      [7, 2],
      [12, 15],
    ]) {
      const d = mannWhitneyExactDistribution(m, n);
      expect(d.length).toBe(m * n + 1);
      expect(d.reduce((s, v) => s + v, 0)).toBeCloseTo(1, 12);
      for (let u = 0; u <= m * n; u++) expect(d[u]).toBeCloseTo(d[m * n - u], 14);
      expect(d.reduce((s, v, u) => s + u * v, 0)).toBeCloseTo((m * n) / 2, 9);
    }
  });
});

describe("compareGroups() properties", () => {
  it("swapping groups flips t and meanDiff, keeps p; U_a + U_b = n_a·n_b", () => {
    fc.assert(
      fc.property(group, group, (a, b) => {
        const ab = compareGroups(a, b);
        const ba = compareGroups(b, a);
        return (
          same(ab.welch.t, -ba.welch.t) &&
          same(ab.welch.p, ba.welch.p) &&
          ab.mannWhitney.U + ba.mannWhitney.U === a.length * b.length &&
          same(ab.mannWhitney.p, ba.mannWhitney.p) &&
          same(ab.brownForsythe.F, ba.brownForsythe.F)
        );
      }),
    );
  });

  it("p-values lie in [0, 1]", () => {
    fc.assert(
      fc.property(group, group, (a, b) => {
        const r = compareGroups(a, b);
        return [r.welch.p, r.mannWhitney.p, r.brownForsythe.p].every((p) => Number.isNaN(p) || (p >= 0 && p <= 1));
      }),
    );
  });

  it("Brown–Forsythe ignores a shift of one group; Welch's t ignores a common scale", () => {
    fc.assert(
      fc.property(group, group, fc.integer({ min: -1000, max: 1000 }), fc.integer({ min: 1, max: 100 }), (a, b, shift, scale) => {
        const f0 = brownForsythe([a, b]).F;
        const f1 = brownForsythe([a, b.map((v) => v + shift)]).F;
        const t0 = compareGroups(a, b).welch.t;
        const t1 = compareGroups(
          a.map((v) => v * scale),
          b.map((v) => v * scale),
        ).welch.t;
        return same(f0, f1) && same(t0, t1);
      }),
      // Equal means (−0.2 each): t is zero up to rounding, with a different sign after scaling.
      { examples: [[[42, 15, 12, -41, 25, -28, -8, -20, -12, 13], [-2, 45, 5, -49, 0], 0, 3]] },
    );
  });
});
