import { describe, expect, it } from "vitest";
import type { ModelInfo } from "@/components/analysis/api";
import { buildOptions, EMPTY_DRAFT, type ParamDraft } from "@/components/analysis/fit-options";

const params = [{ name: "A" }, { name: "T2" }, { name: "n" }] as unknown as ModelInfo["parameters"];
const columns = { x: "tau", y: "signal", sigma: "" };
const draft = (d: Partial<ParamDraft>): ParamDraft => ({ ...EMPTY_DRAFT, ...d });

describe("the fit form's parameters → the request's options", () => {
  it("sends start values, held values and both ends of a range as start, fixed and bounds", () => {
    const built = buildOptions(
      params,
      { A: draft({ value: "0.8" }), T2: draft({ value: "12", fixed: true, lower: "1", upper: "2" }), n: draft({ lower: "0.5", upper: "3" }) },
      columns,
    );
    expect(built).toEqual({ options: { x: "tau", y: "signal", start: { A: 0.8 }, fixed: { T2: 12 }, bounds: { n: [0.5, 3] } } });
  });

  it("leaves blanks to the model", () => {
    expect(buildOptions(params, {}, { ...columns, sigma: "sigma" })).toEqual({ options: { x: "tau", y: "signal", sigma: "sigma" } });
  });

  it("names the field in its words when a number does not read", () => {
    expect(buildOptions(params, { T2: draft({ value: "abc" }) }, columns)).toEqual({ error: "T2 start value: “abc” is not a number." });
    expect(buildOptions(params, { T2: draft({ value: "x", fixed: true }) }, columns)).toEqual({ error: "T2 held value: “x” is not a number." });
    expect(buildOptions(params, { T2: draft({ fixed: true }) }, columns)).toEqual({ error: "T2: give the value to hold it at." });
    expect(buildOptions(params, { n: draft({ lower: "1", upper: "two" }) }, columns)).toEqual({ error: "n range to: “two” is not a number." });
    expect(buildOptions(params, { n: draft({ lower: "3", upper: "1" }) }, columns)).toEqual({
      error: "n: the range must run from a smaller to a larger number.",
    });
  });

  it("fills an end left blank from the model's defaults, and asks for them when unknown", () => {
    expect(buildOptions(params, { n: draft({ upper: "1.5" }) }, columns)).toEqual({ needDefaults: true });
    expect(buildOptions(params, { n: draft({ upper: "1.5" }) }, columns, { n: [0.5, 4] })).toEqual({
      options: { x: "tau", y: "signal", bounds: { n: [0.5, 1.5] } },
    });
    expect(buildOptions(params, { n: draft({ lower: "1" }) }, columns, { n: [0, null] })).toEqual({
      error: "n: by default its range is open above; give both ends of the range.",
    });
  });
});
