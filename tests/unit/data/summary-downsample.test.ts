import { describe, expect, it } from "vitest";
import { summarizeColumn } from "@/lib/data/summary";
import { lttb, minMaxPerBucket } from "@/lib/data/downsample";

describe("summarizeColumn", () => {
  it("counts, skips missing and matches the two-pass formulas", () => {
    const v = new Float64Array([2, 4, NaN, 4, 4, 5, 5, 7, 9, NaN]);
    const s = summarizeColumn(v);
    expect(s).toMatchObject({ count: 8, missing: 2, min: 2, max: 9, mean: 5 });
    expect(s.sd).toBeCloseTo(Math.sqrt(32 / 7), 12);
  });

  it("stays accurate with a large offset (GHz frequencies varying by Hz)", () => {
    const v = Array.from({ length: 1000 }, (_, i) => 2.87e9 + (i % 10));
    const s = summarizeColumn(v);
    expect(s.mean).toBeCloseTo(2.87e9 + 4.5, 4);
    expect(s.sd).toBeCloseTo(Math.sqrt((1000 / 999) * 8.25), 6);
  });

  it("handles empty, single and infinite values", () => {
    expect(summarizeColumn([])).toMatchObject({ count: 0, missing: 0 });
    expect(Number.isNaN(summarizeColumn([]).mean)).toBe(true);
    const one = summarizeColumn([3]);
    expect(one).toMatchObject({ count: 1, min: 3, max: 3, mean: 3 });
    expect(Number.isNaN(one.sd)).toBe(true);
    expect(summarizeColumn([1, Infinity, 3])).toMatchObject({ count: 2, missing: 1, mean: 2 });
  });
});

/** An ODMR-like trace: flat with a one-sample-wide dip and one spike, plus small noise. */
function trace(n: number) {
  const x = Array.from({ length: n }, (_, i) => 2.8e9 + i * 1e3);
  let s = 7;
  const y = x.map(() => {
    s = (s * 16807) % 2147483647;
    return 1 + 0.001 * (s / 2147483647 - 0.5);
  });
  y[31_337] = 0.7; // the dip
  y[77_001] = 1.2; // a spike
  return { x, y };
}

describe("downsampling keeps extremes", () => {
  const { x, y } = trace(100_000);

  it("minMaxPerBucket keeps the dip and spike, in x order, at most 2 points per bucket", () => {
    const d = minMaxPerBucket(x, y, 500);
    expect(d.x.length).toBeLessThanOrEqual(1000);
    expect(d.y).toContain(0.7);
    expect(d.y).toContain(1.2);
    expect(d.x[d.y.indexOf(0.7)]).toBe(x[31_337]);
    for (let i = 1; i < d.x.length; i++) expect(d.x[i]).toBeGreaterThan(d.x[i - 1]);
  });

  it("lttb returns the threshold, keeps first, last, the dip and the spike", () => {
    const d = lttb(x, y, 300);
    expect(d.x.length).toBe(300);
    expect(d.x[0]).toBe(x[0]);
    expect(d.x[299]).toBe(x[x.length - 1]);
    expect(d.y).toContain(0.7);
    expect(d.y).toContain(1.2);
    for (let i = 1; i < d.x.length; i++) expect(d.x[i]).toBeGreaterThan(d.x[i - 1]);
  });

  it("keeps both extremes even when they share a bucket", () => {
    const n = 10_000;
    const xs = Array.from({ length: n }, (_, i) => i);
    const ys = xs.map((i) => Math.sin(i / 500) * 0.01);
    ys[5000] = -5;
    ys[5001] = 5;
    const d = lttb(xs, ys, 20);
    expect(d.y).toContain(-5);
    expect(d.y).toContain(5);
    expect(d.x.length).toBeLessThanOrEqual(21);
  });

  it("skips NaN points and passes short series through", () => {
    expect(lttb([0, 1, 2], [1, NaN, 3], 10)).toEqual({ x: [0, 2], y: [1, 3] });
    expect(minMaxPerBucket([0, 1, 2, 3], [4, 3, 2, 1], 1)).toEqual({ x: [0, 3], y: [4, 1] });
    expect(minMaxPerBucket([], [], 10)).toEqual({ x: [], y: [] });
  });
});
