/**
 * Areal density of bright spots (single centres) on a PL map: pixels with value strictly above a
 * threshold are joined into connected spots (4- or 8-connectivity, 8 by default), counted, and
 * divided by the scanned area. Positions and pixel sizes in µm, densities in spots/µm².
 * The scanned area is nx·dx × ny·dy: each sample is the centre of one dx × dy pixel.
 */
import { type Calculator, withCaution } from "./calculator-types";

type Connectivity = 4 | 8;

/** Long-format map: one row per pixel, positions in µm, any value unit (e.g. counts/s). */
export interface LongFormatMap {
  x: readonly number[];
  y: readonly number[];
  value: readonly number[];
}

/** Matrix map: values[row][col], row ↔ y, col ↔ x; pixel sizes and origin in µm. */
export interface MatrixMap {
  values: readonly (readonly number[])[];
  pixelSizeX: number;
  pixelSizeY?: number;
  originX?: number;
  originY?: number;
}

export interface SpotCountOptions {
  /** A pixel is bright when value > threshold (NaN never is). */
  threshold: number;
  /** 4: edge neighbours only; 8 (default): edge and corner neighbours. */
  connectivity?: Connectivity;
  /** Spots with fewer pixels are discarded (default 1: keep all). */
  minPixels?: number;
}

interface Spot {
  pixels: number;
  /** Unweighted centroid, µm. */
  x: number;
  y: number;
  /** Largest value in the spot. */
  peak: number;
  touchesEdge: boolean;
}

export interface SpotCountResult {
  count: number;
  areaUm2: number;
  densityPerUm2: number;
  connectivity: Connectivity;
  threshold: number;
  grid: { nx: number; ny: number; dx: number; dy: number };
  spots: Spot[];
  notes: string[];
}

interface Grid {
  nx: number;
  ny: number;
  dx: number;
  dy: number;
  x0: number;
  y0: number;
  /** Row-major, index = iy * nx + ix; NaN where no sample. */
  cells: Float64Array;
  notes: string[];
}

function uniqueAxis(values: readonly number[], axis: string, notes: string[]): number[] {
  const sorted = [...values].sort((a, b) => a - b);
  const range = sorted[sorted.length - 1] - sorted[0];
  const tol = range > 0 ? range * 1e-6 : 0;
  const out: number[] = [sorted[0]];
  for (const v of sorted) if (v - out[out.length - 1] > tol) out.push(v);
  if (out.length > 2) {
    const step = (out[out.length - 1] - out[0]) / (out.length - 1);
    for (let i = 1; i < out.length; i++) {
      if (Math.abs(out[i] - out[i - 1] - step) > 0.01 * step) {
        notes.push(`${axis} positions are not evenly spaced; the area assumes a regular grid.`);
        break;
      }
    }
  }
  return out;
}

function nearestIndex(axis: number[], v: number): number {
  let lo = 0;
  let hi = axis.length - 1;
  while (hi - lo > 1) {
    const mid = (lo + hi) >> 1;
    if (axis[mid] <= v) lo = mid;
    else hi = mid;
  }
  return Math.abs(axis[hi] - v) < Math.abs(axis[lo] - v) ? hi : lo;
}

function gridFromLong(map: LongFormatMap): Grid {
  const n = map.value.length;
  if (map.x.length !== n || map.y.length !== n) throw new RangeError("x, y and value must have the same length");
  if (n === 0) throw new RangeError("the map is empty");
  if (!map.x.every(Number.isFinite) || !map.y.every(Number.isFinite)) throw new RangeError("x and y must be finite");
  const notes: string[] = [];
  const xs = uniqueAxis(map.x, "x", notes);
  const ys = uniqueAxis(map.y, "y", notes);
  if (xs.length < 2 || ys.length < 2) throw new RangeError("a long-format map needs at least two distinct x and y positions");
  const nx = xs.length;
  const ny = ys.length;
  const cells = new Float64Array(nx * ny).fill(NaN);
  let duplicates = 0;
  for (let i = 0; i < n; i++) {
    const k = nearestIndex(ys, map.y[i]) * nx + nearestIndex(xs, map.x[i]);
    if (!Number.isNaN(cells[k])) duplicates++;
    cells[k] = Number.isNaN(cells[k]) ? map.value[i] : Math.max(cells[k], map.value[i]);
  }
  if (duplicates > 0) notes.push(`${duplicates} repeated position(s): the larger value was kept.`);
  if (n - duplicates < nx * ny) notes.push(`${nx * ny - (n - duplicates)} grid cell(s) have no sample and count as dark.`);
  const dx = (xs[nx - 1] - xs[0]) / (nx - 1);
  const dy = (ys[ny - 1] - ys[0]) / (ny - 1);
  return { nx, ny, dx, dy, x0: xs[0], y0: ys[0], cells, notes };
}

function gridFromMatrix(map: MatrixMap): Grid {
  const ny = map.values.length;
  const nx = ny > 0 ? map.values[0].length : 0;
  if (ny === 0 || nx === 0) throw new RangeError("the map is empty");
  if (map.values.some((row) => row.length !== nx)) throw new RangeError("all matrix rows must have the same length");
  const dx = map.pixelSizeX;
  const dy = map.pixelSizeY ?? map.pixelSizeX;
  if (!(dx > 0) || !(dy > 0) || !Number.isFinite(dx) || !Number.isFinite(dy)) throw new RangeError("pixel sizes must be positive and finite");
  const cells = new Float64Array(nx * ny);
  map.values.forEach((row, iy) => row.forEach((v, ix) => (cells[iy * nx + ix] = v)));
  return { nx, ny, dx, dy, x0: map.originX ?? 0, y0: map.originY ?? 0, cells, notes: [] };
}

/** Counts connected bright spots on a PL map and divides by the scanned area (spots/µm²). */
export function countSpots(map: LongFormatMap | MatrixMap, options: SpotCountOptions): SpotCountResult {
  const connectivity = options.connectivity ?? 8;
  if (connectivity !== 4 && connectivity !== 8) throw new RangeError("connectivity must be 4 or 8");
  if (!Number.isFinite(options.threshold)) throw new RangeError("threshold must be finite");
  const minPixels = options.minPixels ?? 1;
  const g = "values" in map ? gridFromMatrix(map) : gridFromLong(map);
  const { nx, ny, cells } = g;
  const offsets =
    connectivity === 4
      ? [
          [1, 0],
          [-1, 0],
          [0, 1],
          [0, -1],
        ]
      : [
          [1, 0],
          [-1, 0],
          [0, 1],
          [0, -1],
          [1, 1],
          [1, -1],
          [-1, 1],
          [-1, -1],
        ];
  const seen = new Uint8Array(nx * ny);
  const spots: Spot[] = [];
  const stack: number[] = [];
  for (let start = 0; start < nx * ny; start++) {
    if (seen[start] || !(cells[start] > options.threshold)) continue;
    seen[start] = 1;
    stack.push(start);
    let pixels = 0,
      sx = 0,
      sy = 0,
      peak = -Infinity,
      touchesEdge = false;
    while (stack.length > 0) {
      const k = stack.pop() as number;
      const ix = k % nx;
      const iy = (k - ix) / nx;
      pixels++;
      sx += ix;
      sy += iy;
      peak = Math.max(peak, cells[k]);
      if (ix === 0 || iy === 0 || ix === nx - 1 || iy === ny - 1) touchesEdge = true;
      for (const [ox, oy] of offsets) {
        const jx = ix + ox;
        const jy = iy + oy;
        if (jx < 0 || jy < 0 || jx >= nx || jy >= ny) continue;
        const j = jy * nx + jx;
        if (!seen[j] && cells[j] > options.threshold) {
          seen[j] = 1;
          stack.push(j);
        }
      }
    }
    if (pixels >= minPixels) {
      spots.push({ pixels, x: g.x0 + (sx / pixels) * g.dx, y: g.y0 + (sy / pixels) * g.dy, peak, touchesEdge });
    }
  }
  const areaUm2 = nx * g.dx * ny * g.dy;
  const notes = [...g.notes, `${connectivity}-connectivity; area = nx·dx × ny·dy (pixel-centred samples).`];
  const edge = spots.filter((s) => s.touchesEdge).length;
  if (edge > 0) notes.push(`${edge} spot(s) touch the map edge and are counted whole.`);
  return {
    count: spots.length,
    areaUm2,
    densityPerUm2: spots.length / areaUm2,
    connectivity,
    threshold: options.threshold,
    grid: { nx, ny, dx: g.dx, dy: g.dy },
    spots,
    notes,
  };
}

/** 1 µm² in cm². */
const UM2_IN_CM2 = 1e-8;

export const arealDensityCalculator: Calculator = {
  id: "spot-areal-density",
  title: "Spot count → areal density",
  formula: "n = N / (W · H)",
  assumptions: withCaution(
    "Each bright spot is one centre; unresolved pairs count once and background blobs count as centres.",
    "Count spots with the map tool (threshold, 4- or 8-connectivity) or by hand; the area is the whole scan.",
  ),
  source: "Common practice",
  inputs: [
    { name: "N", label: "Spot count N", unit: "1", default: 10, min: 0 },
    { name: "W", label: "Scan width W", unit: "µm", default: 10, min: 0, max: 1e6, exclusiveMin: true },
    { name: "H", label: "Scan height H", unit: "µm", default: 10, min: 0, max: 1e6, exclusiveMin: true },
  ],
  outputs: [
    { name: "density", label: "Areal density", unit: "µm⁻²" },
    { name: "density_cm2", label: "Areal density", unit: "cm⁻²" },
  ],
  compute({ N, W, H }) {
    const density = N / (W * H);
    return { density, density_cm2: density / UM2_IN_CM2 };
  },
};
