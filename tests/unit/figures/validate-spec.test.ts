import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { FIGURE_TEMPLATES } from "@/lib/figures/templates";
import { MAX_SPEC_BYTES, validateSpec } from "@/lib/figures/validate-spec";
import { errorsOf, expectError, unit } from "./spec-test-helpers";

describe("validateSpec: good specs", () => {
  it("accepts a plain unit spec and reports the data names to bind", () => {
    const r = validateSpec(unit());
    expect(r).toMatchObject({ ok: true, dataNames: ["echo"] });
  });

  it("accepts every builder template with its defaults and with its optional parts switched on and off", () => {
    const variants: Record<string, Array<Record<string, unknown>>> = {
      "decay-curve": [{}, { sigmaField: "sigma", xScale: "log" }, { fitName: "", residualName: "" }, { xScale: "symlog", residualName: "" }],
      spectrum: [{}, { fitName: "fit", yScale: "log" }, { markers: [] }],
      "pl-map": [{}, { scaleBarUm: 0, colorScheme: "cividis" }],
      "group-strip": [{}, { summary: "median-iqr", yScale: "log" }],
      "nv-nmr": [{}, { xQuantity: "spacing", nucleus: "13C", fitName: "fit" }],
      "scatter-line": [{}, { sigmaField: "s", colorField: "series", marks: "line+points", xScale: "log", yScale: "symlog" }],
      "pulse-scaling": [{}, { fitT2One: 120, fitExponent: 0.667 }, { sigmaField: "" }],
    };
    for (const t of FIGURE_TEMPLATES) {
      for (const options of variants[t.id]!) {
        const r = validateSpec(t.build(options));
        expect(r.ok, `${t.id} ${JSON.stringify(options)}: ${JSON.stringify(r)}`).toBe(true);
        if (r.ok) expect(r.dataNames).toEqual([...t.dataNames({ ...options } as never)].sort());
      }
    }
  });

  it("allows notes in usermeta, small top-level datasets and small inline values, which need no binding", () => {
    const r = validateSpec({
      ...unit({ data: { name: "table" } }),
      usermeta: { description: "echo table", note: { url: "https://example.org", href: "x" } },
      datasets: { table: [{ tau: 1, signal: 2 }] },
      layer: undefined,
    });
    expect(r).toMatchObject({ ok: true, dataNames: [] });
    expect(validateSpec(unit({ data: { values: [{ tau: 1, signal: 1 }] } }))).toMatchObject({ ok: true, dataNames: [] });
  });

  it("accepts expressions built from datum, parameters and allowed functions", () => {
    const spec = unit({
      params: [{ name: "cutoff", value: 3 }],
      transform: [
        { calculate: "log(datum.signal) / LN10 + pow(datum['tau'], 2) * PI", as: "a" },
        { filter: "datum.tau > cutoff && isValid(datum.signal) ? true : false" },
        { calculate: "format(datum.signal, '.2f') + ' µs'", as: "label" },
        { filter: { and: ["datum.a > 0", { field: "tau", range: [0, 10] }] } },
      ],
    });
    expect(validateSpec(spec)).toMatchObject({ ok: true });
  });
});

describe("validateSpec: data loading is refused everywhere", () => {
  const URL_MESSAGE = /specs cannot load data from a URL; bind a dataset version instead/;

  it("data.url to a loopback address", () => {
    expectError(unit({ data: { url: "http://127.0.0.1:3000/api/me" } }), "data.url", URL_MESSAGE);
  });

  it("file URLs and relative paths", () => {
    expectError(unit({ data: { url: "file:///etc/passwd" } }), "data.url", URL_MESSAGE);
    expectError(unit({ data: { url: "../../uploads/x.csv", format: { type: "csv" } } }), "data.url", URL_MESSAGE);
  });

  it("nested in layer, concat, facet, repeat and lookup transforms", () => {
    const hostile = { data: { url: "http://localhost/api/me" }, mark: "point" };
    expectError({ layer: [{ data: { name: "ok" }, mark: "point" }, hostile] }, "layer[1].data.url", URL_MESSAGE);
    expectError({ vconcat: [{ hconcat: [hostile] }] }, "vconcat[0].hconcat[0].data.url", URL_MESSAGE);
    expectError({ data: { name: "a" }, facet: { row: { field: "g" } }, spec: { layer: [hostile] } }, "spec.layer[0].data.url", URL_MESSAGE);
    expectError({ repeat: ["a"], spec: hostile }, "spec.data.url", URL_MESSAGE);
    expectError(
      unit({ transform: [{ lookup: "k", from: { data: { url: "http://[::1]/secrets.json" }, key: "k" } }] }),
      "transform[0].from.data.url",
      URL_MESSAGE,
    );
  });

  it("large inline data and generators", () => {
    const values = Array.from({ length: 5001 }, (_, i) => ({ tau: i, signal: i }));
    expectError(unit({ data: { values } }), "data.values", /limit is 5,000/);
    expectError(unit({ data: { sequence: { start: 0, stop: 1e9 } } }), "data.sequence", /limit is 5,000/);
    expectError(unit({ data: { graticule: true } }), "data", /geographic/);
  });
});

describe("validateSpec: links and images", () => {
  it("href encodings with javascript: URLs", () => {
    expectError(
      unit({ encoding: { x: { field: "tau", type: "quantitative" }, href: { value: "javascript:alert(document.cookie)" } } }),
      "encoding.href",
      /links \(href\)/,
    );
    expectError({ layer: [unit(), unit({ encoding: { href: { field: "link" } } })] }, "layer[1].encoding.href", /links \(href\)/);
  });

  it("href as a mark property or in config", () => {
    expectError(unit({ mark: { type: "point", href: "javascript:alert(1)" } }), "mark.href", /links/);
    expectError(unit({ config: { mark: { href: "https://example.org" } } }), "config.mark.href", /links/);
  });

  it("image marks and url channels", () => {
    expectError(unit({ mark: "image", encoding: { url: { field: "u" } } }), "mark", /image marks/);
    expectError({ vconcat: [unit({ mark: { type: "image" } })] }, "vconcat[0].mark.type", /image marks/);
    expectError(unit({ encoding: { url: { value: "file:///etc/passwd" } } }), "encoding.url", /images and URLs/);
  });
});

describe("validateSpec: usermeta holds notes only", () => {
  it("refuses other keys: vega-embed reads usermeta.embedOptions", () => {
    expectError(unit({ usermeta: { embedOptions: { actions: true } } }), "usermeta.embedOptions", /set by Prooflight and cannot come from a spec/);
    expectError(unit({ usermeta: { anything: { url: "https://example.org" } } }), "usermeta.anything", /usermeta may only hold/);
  });
});

describe("validateSpec: schema errors carry their path", () => {
  it("an unknown mark, an unknown channel and a misspelt type", () => {
    expectError(unit({ mark: "pointy" }), "mark", /must be .*"point"/);
    expectError(unit({ encoding: { colour: { field: "a" } } }), "encoding.colour", /not a property/);
    expectError(unit({ encoding: { x: { field: "t", type: "quantitive" } } }), "encoding.x.type", /"quantitative"/);
  });

  it("a Vega (not Vega-Lite) spec", () => {
    const errors = errorsOf({ $schema: "https://vega.github.io/schema/vega/v5.json", signals: [], marks: [] });
    expect(errors[0]).toMatchObject({ path: "$schema" });
  });

  it("not an object, not JSON, too deep, too big", () => {
    expect(errorsOf([1, 2])[0]!.message).toMatch(/JSON object/);
    expect(errorsOf(unit({ width: NaN }))[0]).toMatchObject({ path: "width", message: expect.stringMatching(/finite/) });
    expect(errorsOf(unit({ description: BigInt(1) }))[0]!.message).toMatch(/not plain JSON/);
    let deep: Record<string, unknown> = {};
    for (let i = 0; i < 200; i++) deep = { usermeta: deep };
    expect(errorsOf(deep)[0]!.message).toMatch(/nested more than/);
    const big = unit({ usermeta: { note: "x".repeat(MAX_SPEC_BYTES) } });
    expect(errorsOf(big)[0]!.message).toMatch(/the limit is 256 kB/);
  });

  it("reports at most ten errors, with JSON pointers", () => {
    const spec = { layer: Array.from({ length: 20 }, () => ({ data: { url: "http://127.0.0.1/" }, mark: "point" })) };
    const errors = errorsOf(spec);
    expect(errors).toHaveLength(10);
    expect(errors[3]).toMatchObject({ path: "layer[3].data.url", pointer: "/layer/3/data/url" });
  });
});

describe("validateSpec never throws", () => {
  it("on arbitrary JSON", () => {
    fc.assert(
      fc.property(fc.jsonValue({ maxDepth: 6 }), (v) => {
        const r = validateSpec(v);
        return typeof r.ok === "boolean";
      }),
      { numRuns: 400 },
    );
  });

  it("on arbitrary objects shaped like specs", () => {
    const key = fc.constantFrom(
      "data",
      "mark",
      "layer",
      "encoding",
      "transform",
      "filter",
      "calculate",
      "url",
      "href",
      "expr",
      "params",
      "name",
      "values",
      "vconcat",
      "x",
      "field",
    );
    const tree = fc.letrec((tie) => ({
      node: fc.oneof(
        { depthSize: "small" },
        fc.jsonValue({ maxDepth: 1 }),
        fc.dictionary(key, tie("node"), { maxKeys: 4 }),
        fc.array(tie("node"), { maxLength: 3 }),
      ),
    }));
    fc.assert(
      fc.property(fc.dictionary(key, tree.node, { maxKeys: 5 }), (v) => typeof validateSpec(v).ok === "boolean"),
      { numRuns: 400 },
    );
  });
});
