/**
 * 2-D maps (PL scans and the like) arrive as a matrix of numbers, optionally with the x axis
 * in the first row and the y axis in the first column. Plots and fits want long format:
 * one row per pixel with columns x, y, value, in row-major order (y outer, x inner).
 */

export interface LongFormat {
  x: Float64Array;
  y: Float64Array;
  value: Float64Array;
  hasAxes: boolean;
  /** Map size without the axes. */
  width: number;
  height: number;
}

function strictlyMonotonic(values: number[]): boolean {
  if (values.length < 2) return false;
  const up = values[1] > values[0];
  for (let i = 1; i < values.length; i++) {
    const a = values[i - 1];
    const b = values[i];
    if (!Number.isFinite(a) || !Number.isFinite(b) || (up ? !(b > a) : !(b < a))) return false;
  }
  return true;
}

/**
 * Axes are assumed when the top-left cell is a label, or when it is empty/NaN/0 and both the
 * first row and the first column run strictly up or down (pixel values almost never do).
 */
export function detectAxes(cols: Float64Array[], rows: number, cornerIsLabel: boolean): boolean {
  if (cols.length < 2 || rows < 2) return false;
  if (cornerIsLabel) return true;
  const corner = cols[0][0];
  if (!(Number.isNaN(corner) || corner === 0)) return false;
  const xAxis = cols.slice(1).map((c) => c[0]);
  const yAxis = Array.from(cols[0].subarray(1));
  return strictlyMonotonic(xAxis) && strictlyMonotonic(yAxis);
}

export function matrixToLong(cols: Float64Array[], rows: number, hasAxes: boolean): LongFormat {
  const c0 = hasAxes ? 1 : 0;
  const width = cols.length - c0;
  const height = rows - c0;
  const size = width * height;
  const x = new Float64Array(size);
  const y = new Float64Array(size);
  const value = new Float64Array(size);
  let k = 0;
  for (let i = c0; i < rows; i++) {
    const yi = hasAxes ? cols[0][i] : i;
    for (let j = c0; j < cols.length; j++) {
      x[k] = hasAxes ? cols[j][0] : j;
      y[k] = yi;
      value[k] = cols[j][i];
      k++;
    }
  }
  return { x, y, value, hasAxes, width, height };
}
