import { describe, expect, it } from "vitest";
import { prepareSpec, refusalOf } from "@/components/figures/vega-render";

const hostileMeta = {
  description: "echo",
  embedOptions: { actions: true, sourceHeader: "<script>alert(1)</script>", editorUrl: "https://attacker.example/" },
};

describe("prepareSpec: the browser never hands spec-controlled options to vega-embed", () => {
  it("drops usermeta from a single view and keeps the rest", () => {
    const spec = { data: { name: "echo" }, mark: "point", usermeta: hostileMeta };
    const out = prepareSpec(spec, 80, "Inter, sans-serif");
    expect("usermeta" in out).toBe(false);
    expect(out).toEqual({
      data: { name: "echo" },
      mark: "point",
      config: { numberFormat: "~f", font: "Inter, sans-serif" }, // plain numbers: "2700", not "2,700"
      width: 226.77,
      autosize: { type: "fit", contains: "padding" },
    });
    expect(spec.usermeta).toBe(hostileMeta); // the caller's spec is not changed
  });

  it("drops usermeta from a composite spec", () => {
    const out = prepareSpec({ vconcat: [{ mark: "point" }], usermeta: hostileMeta }, 80, "F");
    expect(out).toEqual({ vconcat: [{ mark: "point" }], config: { numberFormat: "~f", font: "F" } });
  });
});

describe("refusalOf: the client-side budget before drawing", () => {
  it("names the first problem with its path", () => {
    expect(refusalOf({ mark: "point", usermeta: hostileMeta })).toBe(
      "usermeta.embedOptions: display options (usermeta.embedOptions) are set by Prooflight and cannot come from a spec",
    );
    expect(refusalOf({ mark: "point", data: { sequence: { start: 0, stop: 1e9 } } })).toBe(
      "data.sequence: inline data holds 1,000,000,000 values in all; the limit is 5,000; bind a dataset version instead",
    );
    expect(refusalOf({ mark: "point", encoding: { x: { field: "a", axis: { tickCount: 1e6 } } } })).toBe(
      "encoding.x.axis.tickCount: tickCount is 1,000,000; the limit is 1,000",
    );
  });

  it("lets an ordinary spec through", () => {
    expect(
      refusalOf({ data: { name: "echo" }, mark: "point", usermeta: { description: "T2 decay" }, encoding: { x: { field: "tau", type: "quantitative" } } }),
    ).toBeNull();
  });
});
