import { describe, expect, it } from "vitest";
import { prepareSeriesForDisplay, toRows } from "@/lib/figures/downsample-for-display";

/** An ODMR-like sweep: 1,000,000 points of noise-free baseline with one single-point dip. */
function sweepWithDip(n: number, dipAt: number): { x: Float64Array; y: Float64Array } {
  const x = new Float64Array(n);
  const y = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    x[i] = 2800 + (150 * i) / (n - 1); // MHz
    y[i] = 1 + 0.002 * Math.sin(i / 1000); // normalised fluorescence
  }
  y[dipAt] = 0.9;
  return { x, y };
}

describe("prepareSeriesForDisplay", () => {
  it("keeps a single-point dip in 1,000,000 points and stays under 200 kB of JSON", () => {
    const { x, y } = sweepWithDip(1_000_000, 612_345);
    const d = prepareSeriesForDisplay(x, y);
    expect(d.method).toBe("min-max");
    expect(d.sourcePoints).toBe(1_000_000);
    expect(Math.min(...d.y)).toBe(0.9);
    // Rounded to well under a pixel column (150 MHz / 2000 columns = 75 kHz).
    expect(Math.abs(d.x[d.y.indexOf(0.9)]! - x[612_345]!)).toBeLessThan(0.075 / 20);
    const json = JSON.stringify({ x: d.x, y: d.y });
    expect(json.length).toBe(d.bytes);
    expect(d.bytes).toBeLessThanOrEqual(200_000);
    for (let i = 1; i < d.x.length; i++) expect(d.x[i]!).toBeGreaterThanOrEqual(d.x[i - 1]!);
  });

  it("halves the columns until a tight byte budget fits, still keeping the dip", () => {
    const { x, y } = sweepWithDip(200_000, 1234);
    const d = prepareSeriesForDisplay(x, y, { columns: 4000, maxBytes: 20_000 });
    expect(d.bytes).toBeLessThanOrEqual(20_000);
    expect(d.columns).toBeLessThan(4000);
    expect(Math.min(...d.y)).toBe(0.9);
  });

  it("returns short series unchanged apart from rounding", () => {
    const d = prepareSeriesForDisplay([1, 2, 3], [0.1234567891, 2, 3]);
    expect(d).toMatchObject({ method: "none", columns: 0, x: [1, 2, 3] });
    expect(d.y[0]).toBeCloseTo(0.1234567891, 5);
  });

  it("sorts unsorted x first and can use LTTB", () => {
    const n = 50_000;
    const x = Array.from({ length: n }, (_, i) => n - i);
    const y = x.map((v) => (v === 777 ? -5 : Math.sin(v / 100)));
    const d = prepareSeriesForDisplay(x, y, { method: "lttb", columns: 500 });
    expect(d.method).toBe("lttb");
    expect(d.x.length).toBeLessThanOrEqual(1002);
    expect(d.x[0]).toBe(1);
    expect(d.y).toContain(-5);
  });

  it("keeps resolution when the offset is large against the span (GHz sweep over 1 MHz, in Hz)", () => {
    const n = 100_000;
    const x = Array.from({ length: n }, (_, i) => 2.87e9 + i * 10);
    const y = x.map((_, i) => (i === 4321 ? 0.5 : 1));
    const d = prepareSeriesForDisplay(x, y);
    expect(new Set(d.x).size).toBe(d.x.length);
    expect(Math.abs(d.x[d.y.indexOf(0.5)]! - x[4321]!)).toBeLessThan(1e6 / 2000 / 20);
  });

  it("gives rows for Vega", () => {
    expect(toRows({ x: [1, 2], y: [3, 4] }, "f", "s")).toEqual([
      { f: 1, s: 3 },
      { f: 2, s: 4 },
    ]);
  });
});
