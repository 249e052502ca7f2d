import { describe, expect, it } from "vitest";
import { checkSpecSecurity } from "@/lib/figures/spec-security";
import { validateSpec } from "@/lib/figures/validate-spec";
import { errorsOf, expectError, unit } from "./spec-test-helpers";

describe("usermeta cannot carry vega-embed options (stored XSS through the reviewer's browser)", () => {
  it("refuses usermeta.embedOptions with actions, i18n, a <script> sourceHeader, a patch and an editor URL", () => {
    const spec = unit({
      usermeta: {
        embedOptions: {
          actions: true,
          sourceHeader: "<script>alert(1)</script>",
          i18n: { SOURCE_ACTION: "Click here to see the corrected panel" },
          patch: [{ op: "add", path: "/data/0/url", value: "https://example.org/x.json" }],
          editorUrl: "https://attacker.example/editor",
        },
      },
    });
    const errors = errorsOf(spec);
    expect(errors[0]).toEqual({
      path: "usermeta.embedOptions",
      pointer: "/usermeta/embedOptions",
      message: "display options (usermeta.embedOptions) are set by Prooflight and cannot come from a spec",
    });
  });

  it("refuses embedOptions even when empty, and hidden inside an allowed key", () => {
    expectError(unit({ usermeta: { embedOptions: {} } }), "usermeta.embedOptions", /set by Prooflight/);
    expectError(unit({ usermeta: { note: { embedOptions: { actions: true } } } }), "usermeta.note.embedOptions", /set by Prooflight/);
  });

  it("refuses keys outside the allow-list, non-object usermeta, deep values and __proto__", () => {
    expectError(unit({ usermeta: { theme: "dark" } }), "usermeta.theme", /usermeta may only hold description, note, notes, source and tags/);
    expectError(unit({ usermeta: "hello" }), "usermeta", /usermeta must be an object/);
    expectError(unit({ usermeta: { note: { a: { b: { c: "deep" } } } } }), "usermeta.note.a.b", /small lists or objects/);
    expectError(JSON.parse('{"mark":"point","usermeta":{"note":{"__proto__":{"x":1}}}}'), "usermeta.note.__proto__", /"__proto__" is not allowed/);
  });

  it("refuses __proto__ in inline rows and datasets", () => {
    expectError(JSON.parse('{"mark":"point","data":{"values":[{"__proto__":{"polluted":1}}]}}'), "data.values[0].__proto__", /"__proto__" is not allowed/);
    expectError(
      JSON.parse('{"mark":"point","data":{"name":"t"},"datasets":{"t":[{"a":{"__proto__":1}}]}}'),
      "datasets.t[0].a.__proto__",
      /"__proto__" is not allowed/,
    );
  });

  it("still accepts harmless usermeta: text, numbers, tags and small objects", () => {
    const r = validateSpec(
      unit({
        usermeta: {
          description: "T2 echo decay, NV ensemble",
          note: { sample: "B14", temperatureK: 4.2, checked: true, link: { url: "https://example.org" } },
          notes: ["first draft", 2],
          source: "lab notebook p. 41",
          tags: ["nv", "t2"],
        },
      }),
    );
    expect(r).toMatchObject({ ok: true, dataNames: ["echo"] });
  });
});

describe("budgets for specs that would hang a browser", () => {
  it("a huge data sequence counts as inline values", () => {
    expectError(unit({ data: { sequence: { start: 0, stop: 1e8, step: 1 } } }), "data.sequence", /100,000,000 values in all; the limit is 5,000/);
  });

  it("axis and legend tickCount", () => {
    expectError(
      unit({ encoding: { x: { field: "tau", type: "quantitative", axis: { tickCount: 1e7 } } } }),
      "encoding.x.axis.tickCount",
      /tickCount is 10,000,000; the limit is 1,000/,
    );
    expectError(unit({ config: { legend: { tickCount: 5000 } } }), "config.legend.tickCount", /the limit is 1,000/);
    expectError(
      unit({ config: { axis: { tickCount: { expr: "1e9" } } } }),
      "config.axis.tickCount",
      /tickCount must be a number or a time interval here, not an expression/,
    );
  });

  it("maxbins, bin step over a given extent, and scale bins", () => {
    const binned = (bin: unknown) =>
      unit({ mark: "bar", encoding: { x: { field: "tau", type: "quantitative", bin }, y: { aggregate: "count", type: "quantitative" } } });
    expectError(binned({ maxbins: 1e6 }), "encoding.x.bin.maxbins", /maxbins is 1,000,000; the limit is 1,000/);
    expectError(binned({ extent: [0, 1], step: 1e-7 }), "encoding.x.bin.step", /10,000,000 bins; the limit is 1,000/);
    expectError(binned({ step: 0 }), "encoding.x.bin.step", /must be a positive number/);
    expectError(unit({ transform: [{ bin: { maxbins: 5000 }, field: "tau", as: "b" }] }), "transform[0].bin.maxbins", /the limit is 1,000/);
    expectError(
      unit({ encoding: { x: { field: "tau", type: "quantitative", scale: { bins: { start: 0, stop: 1, step: 1e-6 } } } } }),
      "encoding.x.scale.bins.step",
      /1,000,000 bins; the limit is 1,000/,
    );
  });

  it("density steps, quantile step and regression order", () => {
    expectError(unit({ transform: [{ density: "signal", steps: 1e6 }] }), "transform[0].steps", /steps is 1,000,000; the limit is 1,000/);
    expectError(unit({ transform: [{ density: "signal", minsteps: 2000 }] }), "transform[0].minsteps", /the limit is 1,000/);
    expectError(unit({ transform: [{ density: "signal", maxsteps: 1e9 }] }), "transform[0].maxsteps", /the limit is 1,000/);
    expectError(unit({ transform: [{ quantile: "signal", step: 1e-7 }] }), "transform[0].step", /10,000,000 quantiles; the limit is 1,000/);
    expectError(
      unit({ transform: [{ regression: "signal", on: "tau", method: "poly", order: 5000 }] }),
      "transform[0].order",
      /order is 5,000; the limit is 20/,
    );
    expectError(unit({ transform: [{ regression: "signal", on: "constructor" }] }), "transform[0].on", /constructor/);
  });

  it("impute key sequences", () => {
    expectError(
      unit({
        encoding: { x: { field: "tau", type: "quantitative" }, y: { field: "signal", type: "quantitative", impute: { keyvals: { start: 0, stop: 1e7 } } } },
      }),
      "encoding.y.impute.keyvals",
      /10,000,000 key values; the limit is 5,000/,
    );
    expectError(
      unit({ transform: [{ impute: "signal", key: "tau", keyvals: { stop: 10, step: 0 } }] }),
      "transform[0].keyvals",
      /numeric stop and a non-zero step/,
    );
  });

  it("absurd view sizes and steps", () => {
    expectError(unit({ width: 1e7 }), "width", /width is 10,000,000; the limit is 10,000/);
    expectError(unit({ height: { step: 50_000 } }), "height.step", /the limit is 10,000/);
    expectError(unit({ config: { view: { continuousWidth: 1e6 } } }), "config.view.continuousWidth", /the limit is 10,000/);
    expectError(unit({ config: { view: { step: 1e6 } } }), "config.view.step", /the limit is 10,000/);
  });

  it("too many views from repeat and concat", () => {
    const cell = { mark: "point", encoding: { x: { field: { repeat: "row" }, type: "quantitative" } } };
    const many = Array.from({ length: 30 }, (_, i) => `f${i}`);
    expectError({ data: { name: "t" }, repeat: { row: many, column: many }, spec: cell }, "repeat", /draws 900 views; the limit is 200/);
    expectError({ vconcat: Array.from({ length: 201 }, () => ({ data: { name: "t" }, mark: "point" })) }, "vconcat", /draws 201 views; the limit is 200/);
  });

  it("accepts ordinary settings at the caps", () => {
    const r = validateSpec(
      unit({
        width: 10_000,
        transform: [
          { density: "signal", steps: 1000 },
          { quantile: "signal", step: 0.001 },
          { regression: "signal", on: "tau", method: "poly", order: 20 },
        ],
        encoding: {
          x: { field: "tau", type: "quantitative", bin: { extent: [0, 100], step: 0.1 }, axis: { tickCount: 1000 } },
          y: { field: "signal", type: "quantitative", axis: { tickCount: "month" }, impute: { keyvals: { start: 0, stop: 5000 } } },
        },
      }),
    );
    expect(r.ok, JSON.stringify(r)).toBe(true);
  });

  it("the pure checker reports the same budget issues on its own (the browser runs it before drawing)", () => {
    const report = checkSpecSecurity({
      mark: "point",
      usermeta: { embedOptions: { actions: true } },
      encoding: { x: { field: "a", axis: { tickCount: 2e6 } } },
    });
    expect(report.issues).toEqual([
      { path: ["usermeta", "embedOptions"], message: "display options (usermeta.embedOptions) are set by Prooflight and cannot come from a spec" },
      { path: ["encoding", "x", "axis", "tickCount"], message: "tickCount is 2,000,000; the limit is 1,000" },
    ]);
  });
});

describe("expressions cannot allocate without bound", () => {
  it("refuses sequence() and pad() in a calculate transform", () => {
    expectError(unit({ transform: [{ calculate: "length(sequence(0, 1e9))", as: "n" }] }), "transform[0].calculate", /sequence/);
    expectError(unit({ transform: [{ calculate: "pad('x', 1e9)", as: "p" }] }), "transform[0].calculate", /pad/);
  });
});
