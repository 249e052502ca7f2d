import { describe, expect, it } from "vitest";
import type { TopLevelSpec } from "vega-lite";
import { addFitValueLayer, readFitValueOption, withFitValue } from "@/lib/figures/fit-value-layer";
import { FIGURE_TEMPLATES } from "@/lib/figures/templates";
import { validateSpec } from "@/lib/figures/validate-spec";

const TEXT_LAYER = {
  data: { name: "fitValue" },
  transform: [{ filter: { field: "name", equal: "T2" } }],
  mark: { type: "text", align: "right", baseline: "top", x: "width", y: 0, dx: -4, dy: 4 },
  encoding: { text: { field: "text", type: "nominal" } },
};

describe("readFitValueOption", () => {
  it("reads the option and falls back to the top right corner", () => {
    expect(readFitValueOption({ fitValue: { data: "fitValue", parameter: "T2", position: "bottom-left" } })).toEqual({
      data: "fitValue",
      parameter: "T2",
      position: "bottom-left",
    });
    expect(readFitValueOption({ fitValue: { data: "fitValue", parameter: "T2", position: "middle" } })?.position).toBe("top-right");
  });
  it("is off when absent or incomplete", () => {
    expect(readFitValueOption({})).toBeNull();
    expect(readFitValueOption({ fitValue: { data: "fitValue", parameter: "" } })).toBeNull();
  });
});

describe("addFitValueLayer", () => {
  const option = { data: "fitValue", parameter: "T2", position: "top-right" as const };
  it("adds the text layer after the plot's layers", () => {
    const spec = { layer: [{ mark: "point" }] } as unknown as TopLevelSpec;
    expect(addFitValueLayer(spec, option)).toEqual({ layer: [{ mark: "point" }, TEXT_LAYER] });
  });
  it("adds it to the first plot of a stacked panel", () => {
    const spec = { vconcat: [{ layer: [{ mark: "line" }] }, { mark: "point" }] } as unknown as TopLevelSpec;
    expect(addFitValueLayer(spec, option)).toEqual({ vconcat: [{ layer: [{ mark: "line" }, TEXT_LAYER] }, { mark: "point" }] });
  });
  it("turns a single view into layers", () => {
    const spec = { data: { name: "d" }, mark: "point", encoding: { x: { field: "t" } } } as unknown as TopLevelSpec;
    expect(addFitValueLayer(spec, option)).toEqual({ data: { name: "d" }, layer: [{ mark: "point", encoding: { x: { field: "t" } } }, TEXT_LAYER] });
  });
  it("leaves the spec alone when the option is off", () => {
    const spec = { layer: [] } as unknown as TopLevelSpec;
    expect(addFitValueLayer(spec, null)).toBe(spec);
  });
});

describe("withFitValue", () => {
  it("builds a valid spec for every template and names the extra data", () => {
    for (const t of FIGURE_TEMPLATES) {
      const wrapped = withFitValue(t);
      const options = { fitValue: { data: "fitValue", parameter: "T2", position: "bottom-left" } };
      expect(wrapped.dataNames(options)).toContain("fitValue");
      const spec = wrapped.build(options);
      const result = validateSpec(spec);
      expect(result.ok, `${t.id}: ${JSON.stringify(result)}`).toBe(true);
    }
  });
});
