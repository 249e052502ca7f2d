/** SI prefix factors used at the calculator boundary (inputs and outputs use practical units). */
export const MEGA = 1e6;
export const MILLI = 1e-3;
export const MICRO = 1e-6;
export const NANO = 1e-9;

/** Degrees → radians. */
export function degToRad(deg: number): number {
  return (deg * Math.PI) / 180;
}
