import { describe, expect, it } from "vitest";
import { countSpots, type LongFormatMap } from "@/lib/physics/spot-density";
import { runCalculator } from "@/lib/physics/calculators";

// 6 × 5 synthetic PL map (counts/s), rows ↔ y, columns ↔ x, 0.5 µm pixels.
// Bright pixels (> 100): a 2×2 blob top-left, a diagonal pair in the middle, one isolated pixel.
const M = [
  [500, 400, 10, 10, 10, 10],
  [450, 300, 10, 10, 10, 10],
  [10, 10, 10, 200, 10, 10],
  [10, 10, 10, 10, 250, 10],
  [10, 10, 10, 10, 10, 900],
];
const PIXEL = 0.5;

function toLong(matrix: number[][], dx: number): LongFormatMap {
  const x: number[] = [];
  const y: number[] = [];
  const value: number[] = [];
  matrix.forEach((row, iy) =>
    row.forEach((v, ix) => {
      x.push(ix * dx);
      y.push(iy * dx);
      value.push(v);
    }),
  );
  return { x, y, value };
}

describe("countSpots", () => {
  it("8-connectivity joins diagonal neighbours", () => {
    const r = countSpots({ values: M, pixelSizeX: PIXEL }, { threshold: 100 });
    expect(r.connectivity).toBe(8);
    // (2,3)-(3,4)-(4,5) form one diagonal chain; the 2×2 blob is the other.
    expect(r.count).toBe(2);
    expect(r.areaUm2).toBeCloseTo(6 * 0.5 * 5 * 0.5, 12); // 7.5 µm²
    expect(r.densityPerUm2).toBeCloseTo(2 / 7.5, 12);
    expect(r.notes.join(" ")).toContain("8-connectivity");
  });

  it("4-connectivity splits diagonal neighbours", () => {
    const r = countSpots({ values: M, pixelSizeX: PIXEL }, { threshold: 100, connectivity: 4 });
    expect(r.count).toBe(4);
    expect(r.spots.map((s) => s.pixels).sort()).toEqual([1, 1, 1, 4]);
  });

  it("reports centroid (µm), peak and edge contact", () => {
    const r = countSpots({ values: M, pixelSizeX: PIXEL }, { threshold: 100, connectivity: 4 });
    const blob = r.spots.find((s) => s.pixels === 4);
    expect(blob).toMatchObject({ x: 0.25, y: 0.25, peak: 500, touchesEdge: true });
    const corner = r.spots.find((s) => s.peak === 900);
    expect(corner).toMatchObject({ x: 2.5, y: 2, touchesEdge: true });
  });

  it("uses a strict threshold and minPixels", () => {
    expect(countSpots({ values: M, pixelSizeX: PIXEL }, { threshold: 900 }).count).toBe(0);
    expect(countSpots({ values: M, pixelSizeX: PIXEL }, { threshold: 899 }).count).toBe(1);
    expect(countSpots({ values: M, pixelSizeX: PIXEL }, { threshold: 100, connectivity: 4, minPixels: 2 }).count).toBe(1);
  });

  it("gives the same answer from a long-format map, in any row order", () => {
    const long = toLong(M, PIXEL);
    const order = long.value.map((_, i) => i).reverse();
    const shuffled = { x: order.map((i) => long.x[i]), y: order.map((i) => long.y[i]), value: order.map((i) => long.value[i]) };
    for (const map of [long, shuffled]) {
      const r = countSpots(map, { threshold: 100 });
      expect(r.count).toBe(2);
      expect(r.grid).toEqual({ nx: 6, ny: 5, dx: 0.5, dy: 0.5 });
      expect(r.areaUm2).toBeCloseTo(7.5, 12);
    }
  });

  it("treats missing long-format cells as dark and says so", () => {
    const long = toLong(M, PIXEL);
    const keep = long.value.map((_, i) => i).filter((i) => i !== 7); // drop (x=0.5, y=0.5), a blob pixel
    const r = countSpots(
      { x: keep.map((i) => long.x[i]), y: keep.map((i) => long.y[i]), value: keep.map((i) => long.value[i]) },
      { threshold: 100, connectivity: 4 },
    );
    expect(r.spots.find((s) => s.peak === 500)?.pixels).toBe(3);
    expect(r.notes.join(" ")).toContain("no sample");
  });

  it("never counts NaN pixels as bright", () => {
    const r = countSpots(
      {
        values: [
          [NaN, 1],
          [1, 1],
        ],
        pixelSizeX: 1,
      },
      { threshold: 0 },
    );
    expect(r.count).toBe(1);
    expect(r.spots[0].pixels).toBe(3);
  });

  it("rejects malformed maps", () => {
    expect(() => countSpots({ values: [[1, 2], [3]], pixelSizeX: 1 }, { threshold: 0 })).toThrow(RangeError);
    expect(() => countSpots({ values: [[1]], pixelSizeX: 0 }, { threshold: 0 })).toThrow(RangeError);
    expect(() => countSpots({ x: [0, 1], y: [0], value: [1, 2] }, { threshold: 0 })).toThrow(RangeError);
    expect(() => countSpots({ x: [0, 1], y: [0, 0], value: [1, 2] }, { threshold: 0 })).toThrow(RangeError);
    expect(() => countSpots({ values: M, pixelSizeX: 1 }, { threshold: NaN })).toThrow(RangeError);
  });

  it("matches the areal-density calculator", () => {
    const r = countSpots({ values: M, pixelSizeX: PIXEL }, { threshold: 100 });
    const calc = runCalculator("spot-areal-density", { N: r.count, W: 3, H: 2.5 }).outputs;
    // 2 spots on 3 µm × 2.5 µm = 7.5 µm²: 0.2667 µm⁻², and 1 cm² = 1e8 µm² → 2.667e7 cm⁻².
    expect(calc.density).toBeCloseTo(2 / 7.5, 12);
    expect(calc.density_cm2).toBeCloseTo((2 / 7.5) * 1e8, 0);
    expect(calc.density).toBeCloseTo(r.densityPerUm2, 12);
  });
});
