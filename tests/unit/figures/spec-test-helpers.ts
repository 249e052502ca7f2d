import { expect } from "vitest";
import { validateSpec, type SpecError } from "@/lib/figures/validate-spec";

/** A plain unit spec reading bound data "echo" (tau, signal), with extra top-level keys. */
export const unit = (extra: Record<string, unknown> = {}) => ({
  $schema: "https://vega.github.io/schema/vega-lite/v6.json",
  data: { name: "echo" },
  mark: "point",
  encoding: { x: { field: "tau", type: "quantitative" }, y: { field: "signal", type: "quantitative" } },
  ...extra,
});

export function errorsOf(spec: unknown): SpecError[] {
  const r = validateSpec(spec);
  expect(r.ok, JSON.stringify(r)).toBe(false);
  return r.ok ? [] : r.errors;
}

/** The spec is refused with an error at `path` whose message matches. */
export function expectError(spec: unknown, path: string, message: RegExp): void {
  const errors = errorsOf(spec);
  expect(
    errors.some((e) => e.path === path && message.test(e.message)),
    JSON.stringify(errors, null, 1),
  ).toBe(true);
}
