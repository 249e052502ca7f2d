import fc from "fast-check";
import { describe as suite, expect, it } from "vitest";
import { describe, quantileSorted } from "@/lib/analysis/stats";
import { groupBy } from "@/lib/analysis/stats";

suite("describe()", () => {
  it("computes every field for a small sample by hand", () => {
    // 2, 4, 4, 4, 5, 5, 7, 9: mean 5, Σ(x − 5)² = 32, sd = √(32/7)
    const d = describe([9, 2, 4, 5, 4, 7, 4, 5]);
    expect(d.n).toBe(8);
    expect(d.mean).toBe(5);
    expect(d.sd).toBeCloseTo(Math.sqrt(32 / 7), 14);
    expect(d.sem).toBeCloseTo(Math.sqrt(32 / 7) / Math.sqrt(8), 14);
    expect(d.median).toBe(4.5);
    expect(d.q1).toBe(4); // type 7: h = 7·0.25 = 1.75 → x₂ + 0.75(x₃ − x₂) = 4
    expect(d.q3).toBe(5.5); // h = 5.25 → x₆ + 0.25(x₇ − x₆) = 5.5
    expect(d.iqr).toBe(1.5);
    expect(d.min).toBe(2);
    expect(d.max).toBe(9);
    // t(0.975, 7) = 2.365 (standard t tables, from memory)
    expect((d.ci95.high - d.mean) / d.sem).toBeCloseTo(2.365, 3);
    expect(d.mean - d.ci95.low).toBeCloseTo(d.ci95.high - d.mean, 12);
    expect(d.notes).toEqual([]);
  });

  it("uses Hyndman–Fan type 7 quantiles (R's quantile(1:10) gives 3.25, 5.5, 7.75; from memory)", () => {
    const s = Array.from({ length: 10 }, (_, i) => i + 1);
    expect([0.25, 0.5, 0.75].map((p) => quantileSorted(s, p))).toEqual([3.25, 5.5, 7.75]);
    expect(quantileSorted(s, 0)).toBe(1);
    expect(quantileSorted(s, 1)).toBe(10);
  });

  it("handles n = 0 and n = 1 with NaN and a note, without throwing", () => {
    const empty = describe([]);
    expect(empty.n).toBe(0);
    for (const v of [empty.mean, empty.sd, empty.median, empty.min, empty.ci95.low]) expect(v).toBeNaN();
    expect(empty.notes.join(" ")).toMatch(/No values/);

    const one = describe([3.5]);
    expect(one).toMatchObject({ n: 1, mean: 3.5, median: 3.5, q1: 3.5, q3: 3.5, iqr: 0, min: 3.5, max: 3.5 });
    for (const v of [one.sd, one.sem, one.ci95.low, one.ci95.high]) expect(v).toBeNaN();
    expect(one.notes.join(" ")).toMatch(/n ≥ 2/);
  });

  it("drops non-finite values with a note", () => {
    const d = describe([1, NaN, 2, Infinity, 3, -Infinity]);
    expect(d.n).toBe(3);
    expect(d.mean).toBe(2);
    expect(d.notes[0]).toMatch(/3 non-finite/);
  });

  it("gives a zero-width interval for constant data", () => {
    const d = describe([0.1, 0.1, 0.1]);
    expect(d.mean).toBe(0.1);
    expect(d.sd).toBe(0);
    expect(d.ci95).toEqual({ low: 0.1, high: 0.1 });
  });

  const sample = fc.array(fc.double({ min: -1e6, max: 1e6, noNaN: true }), { minLength: 1, maxLength: 60 });

  it("property: min ≤ q1 ≤ median ≤ q3 ≤ max, min ≤ mean ≤ max, iqr ≥ 0", () => {
    fc.assert(
      fc.property(sample, (xs) => {
        const d = describe(xs);
        return d.min <= d.q1 && d.q1 <= d.median && d.median <= d.q3 && d.q3 <= d.max && d.min <= d.mean && d.mean <= d.max && d.iqr >= 0 && d.n === xs.length;
      }),
    );
  });

  it("property: sd ≥ 0 and the CI contains the mean for n ≥ 2", () => {
    fc.assert(
      fc.property(
        sample.filter((xs) => xs.length >= 2),
        (xs) => {
          const d = describe(xs);
          return d.sd >= 0 && d.ci95.low <= d.mean && d.mean <= d.ci95.high;
        },
      ),
    );
  });

  it("property: order does not matter", () => {
    fc.assert(
      fc.property(sample, (xs) => {
        const a = describe(xs);
        const b = describe([...xs].reverse());
        return a.median === b.median && a.q1 === b.q1 && a.q3 === b.q3 && Math.abs(a.mean - b.mean) <= 1e-9 * (1 + Math.abs(a.mean));
      }),
    );
  });
});

suite("groupBy()", () => {
  const records = [
    { sample: "A", t2: 10 },
    { sample: "B", t2: 30 },
    { sample: "A", t2: 14 },
    { sample: "B", t2: "n/a" },
    { sample: undefined, t2: 99 },
  ];

  it("describes each group in first-appearance order", () => {
    const g = groupBy(records, "sample", "t2");
    expect(g.map((x) => x.group)).toEqual(["A", "B"]);
    expect(g[0].summary).toMatchObject({ n: 2, mean: 12, min: 10, max: 14 });
    expect(g[1].summary.n).toBe(1);
    expect(g[1].summary.notes.join(" ")).toMatch(/1 non-finite/);
  });

  it("accepts functions and defaults the value field to 'value'", () => {
    const g = groupBy(
      [
        { k: 1, value: 2 },
        { k: 2, value: 4 },
        { k: 1, value: 6 },
      ],
      (r) => (r.k % 2 ? "odd" : "even"),
    );
    expect(g).toEqual([
      expect.objectContaining({ group: "odd", summary: expect.objectContaining({ n: 2, mean: 4 }) }),
      expect.objectContaining({ group: "even", summary: expect.objectContaining({ n: 1, mean: 4 }) }),
    ]);
  });
});
