/** The table-driven exp against the platform's Math.exp and a few exact values. */
import { describe, expect, it } from "vitest";
import { tableExp } from "@/lib/analysis/special/table-exp";

describe("tableExp", () => {
  it("agrees with Math.exp to within 2 units in the last place over the normal range", () => {
    let worst = 0;
    for (let i = 0; i <= 400_000; i++) {
      const x = -708 + (1417.5 * i) / 400_000 + 1e-9 * Math.sin(i);
      const want = Math.exp(x);
      worst = Math.max(worst, Math.abs(tableExp(x) - want) / want);
    }
    for (let i = 0; i <= 200_000; i++) {
      const x = -3 + (6 * i) / 200_000;
      const want = Math.exp(x);
      worst = Math.max(worst, Math.abs(tableExp(x) - want) / want);
    }
    expect(worst).toBeLessThan(2 * Number.EPSILON);
  });

  it("gives exp(0) = 1 exactly, and e, 2 and ½ to rounding", () => {
    expect(tableExp(0)).toBe(1);
    expect(tableExp(-0)).toBe(1);
    expect(Math.abs(tableExp(1) / Math.E - 1)).toBeLessThan(2 * Number.EPSILON);
    // Math.LN2 is ln 2 to within 2.3e-17, so exp of it is 2 to within rounding.
    expect(Math.abs(tableExp(Math.LN2) / 2 - 1)).toBeLessThan(2 * Number.EPSILON);
    expect(Math.abs(tableExp(-Math.LN2) / 0.5 - 1)).toBeLessThan(2 * Number.EPSILON);
  });

  it("defers to Math.exp at the edges: overflow, underflow to subnormals and zero, NaN", () => {
    expect(tableExp(710)).toBe(Infinity);
    expect(tableExp(-720)).toBe(Math.exp(-720));
    expect(tableExp(-800)).toBe(0);
    expect(tableExp(Infinity)).toBe(Infinity);
    expect(tableExp(-Infinity)).toBe(0);
    expect(tableExp(NaN)).toBeNaN();
  });
});
