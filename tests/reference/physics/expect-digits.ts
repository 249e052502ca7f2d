import { expect } from "vitest";

/**
 * Asserts that `actual` rounds to `given` at the number of decimals `given` is written with,
 * i.e. agrees "to the digits given" by the source cited beside the check.
 */
export function expectDigits(actual: number, given: string): void {
  const decimals = given.includes(".") ? given.split(".")[1].length : 0;
  expect(actual.toFixed(decimals)).toBe(given);
}
