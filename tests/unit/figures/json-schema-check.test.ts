import Ajv from "ajv";
import vegaLiteSchema from "vega-lite/vega-lite-schema.json";
import { describe, expect, it } from "vitest";
import { createSchemaChecker, unsupportedKeywords, type JsonSchema } from "@/lib/figures/json-schema-check";
import { FIGURE_TEMPLATES } from "@/lib/figures/templates";

const schema = vegaLiteSchema as unknown as JsonSchema;
const check = createSchemaChecker(schema);

describe("the JSON-schema interpreter", () => {
  it("understands every keyword the installed Vega-Lite schema uses", () => {
    expect(unsupportedKeywords(schema)).toEqual([]);
  });

  it("checks types, enums, ranges, required and unknown properties with paths", () => {
    const c = createSchemaChecker({
      type: "object",
      required: ["a"],
      additionalProperties: false,
      properties: { a: { type: "number", minimum: 0 }, b: { enum: ["x", "y"] }, c: { type: "array", items: { $ref: "#/definitions/S" }, maxItems: 2 } },
      definitions: { S: { type: "string", minLength: 2 } },
    });
    expect(c({ a: 1, b: "x", c: ["ab"] })).toEqual([]);
    expect(c({ b: "z", c: ["a", "bb", "cc"], d: 1 })).toEqual([
      { path: [], message: 'needs the property "a"' },
      { path: ["b"], message: 'must be one of "x" or "y"' },
      { path: ["c"], message: "must have at most 2 items" },
      { path: ["c", 0], message: "must have at least 2 characters" },
      { path: ["d"], message: "is not a property Vega-Lite knows here" },
    ]);
    expect(c({ a: -1 })).toEqual([{ path: ["a"], message: "must be ≥ 0" }]);
  });

  it("reports the closest anyOf branch, or merges the alternatives when none gets started", () => {
    const c = createSchemaChecker({
      anyOf: [
        { type: "object", properties: { kind: { const: "circle" }, r: { type: "number" } }, required: ["kind"], additionalProperties: false },
        { type: "object", properties: { kind: { const: "box" }, w: { type: "number" } }, required: ["kind"], additionalProperties: false },
        { type: "string", enum: ["none"] },
      ],
    });
    expect(c({ kind: "box", w: "wide" })).toEqual([{ path: ["w"], message: "must be a number" }]);
    expect(c(3)).toEqual([{ path: [], message: 'must be "none" or an object' }]);
  });
});

// ajv 8 (a dev dependency, never shipped: it compiles validators with `new Function`) is an
// independent referee for the interpreter on valid and invalid specs. The Vega-Lite schema is draft-07,
// ajv's default; formats ("uri") are not checked, by ajv here or by the interpreter.
describe("agreement with ajv (dev-only referee)", () => {
  it("accepts and rejects the same specs", () => {
    const ajvValidate = new Ajv({ validateFormats: false, logger: false }).compile(schema);
    const corpus: unknown[] = FIGURE_TEMPLATES.flatMap((t) => [t.build({}), t.build({ fitName: "fit", sigmaField: "s" })]);
    const base = { data: { name: "d" }, mark: "point", encoding: { x: { field: "x", type: "quantitative" } } };
    corpus.push(
      base,
      { ...base, mark: "pointy" },
      { ...base, mark: { type: "point", size: -1 } },
      { ...base, encoding: { x: { field: "x", type: "quantitive" } } },
      { ...base, encoding: { colour: { field: "x" } } },
      { ...base, width: "wide" },
      { layer: [base, { ...base, mark: "bar" }] },
      { layer: [base, { ...base, mark: { type: "bar", cornerRadius: "x" } }] },
      { vconcat: [base, { hconcat: [base, { ...base, transform: [{ calculate: 1, as: "y" }] }] }] },
      { ...base, transform: [{ fold: ["a", "b"] }, { window: [{ op: "rank", as: "r" }] }] },
      { ...base, transform: [{ window: [{ op: "nope", as: "r" }] }] },
      { data: { name: "d" }, facet: { row: { field: "g" } }, spec: { mark: "point" } },
      { data: { name: "d" }, repeat: ["a", "b"], spec: { mark: "point", encoding: { x: { field: { repeat: "repeat" }, type: "quantitative" } } } },
      { ...base, params: [{ name: "p", value: 1, bind: { input: "range", min: 0, max: 2 } }] },
      { ...base, params: [{ name: "p", select: "interval" }] },
      { ...base, config: { axis: { labelFontSize: "7" } } },
      { ...base, encoding: { x: { field: "x", type: "quantitative", scale: { type: "symlog", constant: 1 } } } },
      { ...base, encoding: { x: { field: "x", type: "quantitative", scale: { type: "logarithmic" } } } },
      { ...base, encoding: { x: { field: "x", type: "quantitative" }, y: { aggregate: "mean", field: "y" } } },
      { ...base, encoding: { x: { field: "x", type: "quantitative" }, y: { aggregate: "average", field: "y" } } },
    );
    // The referee itself must tell a valid spec from an invalid one, or agreement means nothing.
    expect(ajvValidate(base)).toBe(true);
    expect(ajvValidate({ ...base, mark: "pointy" })).toBe(false);
    for (const spec of corpus) {
      expect(check(spec).length === 0, JSON.stringify(spec).slice(0, 200)).toBe(ajvValidate(spec));
    }
  });
});
