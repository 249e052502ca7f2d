/**
 * The server's closure-compiled expression evaluator must behave exactly like vega-interpreter
 * (the reference CSP-safe evaluator): same SVG for the same spec and data, same refusals.
 */
import * as vega from "vega";
import { compile, type TopLevelSpec } from "vega-lite";
import { expressionInterpreter } from "vega-interpreter";
import { describe, expect, it, vi } from "vitest";
import { FIGURE_TEMPLATES } from "@/lib/figures/templates";
import { compiledExpressions } from "@/lib/server/render/worker/expression-compiler.mjs";
import { normaliseIds } from "@/lib/server/render/worker/render-core.mjs";
import { scatterRows, TEMPLATE_DATA } from "./fixtures";

async function svgWith(expr: unknown, spec: unknown, data: Record<string, object[]>): Promise<string> {
  const vgSpec = compile(spec as TopLevelSpec).spec;
  // The spec's named data sets that expect rows from outside (no values, url or source): every one
  // must be given rows, or both evaluators would agree on an empty chart.
  const external = (vgSpec.data ?? []).filter((d) => !("values" in d) && !("url" in d) && !("source" in d)).map((d) => d.name);
  expect(external.length).toBeGreaterThan(0);
  for (const name of external) expect(Object.keys(data), `rows for data set "${name}"`).toContain(name);
  const runtime = vega.parse(vgSpec, undefined, { ast: true });
  const view = new vega.View(runtime, { renderer: "none", expr, logLevel: vega.None });
  for (const name of external) view.data(name, data[name]!);
  const svg = normaliseIds(await view.toSVG()); // Vega numbers gradients from a global counter
  view.finalize();
  return svg;
}

const features = {
  data: { name: "trace" },
  params: [{ name: "k", value: 2 }],
  transform: [
    { calculate: "pow(datum.t, k) + clamp(datum.s, 0.95, 1.05) * PI", as: "a" },
    { calculate: "datum.t > 0.5 ? upper('hi') : lower('LO') + substring('abcdef', 1, 3)", as: "b" },
    { calculate: "format(datum.s, '.3f') + ' ' + join(['x', 'y'], '-') + length('µs')", as: "c" },
    { calculate: "{u: datum.t, v: [1, 2, datum.s]}.v[2] + {'w': 3}['w'] + (!datum.t ? 1 : 0) + (-datum.s % 2)", as: "d" },
    { calculate: "if(isValid(datum.t), replace('a-b', '-', '+'), 'none') + indexof('abc', 'c') + trim('  x ')", as: "e" },
    { calculate: "test(/^h/, datum.b) ? 1 : 0", as: "f" },
    { calculate: "timeFormat(datetime(2024, 0, 1 + (datum.t * 10 % 28)), '%Y-%m-%d')", as: "g" },
    { filter: "datum.t >= 0.01 && (datum.s < 2 || datum.t == 0)" },
  ],
  mark: { type: "point", tooltip: true },
  encoding: {
    x: { field: "a", type: "quantitative" },
    y: { field: "d", type: "quantitative" },
    color: { field: "b", type: "nominal" },
    shape: { field: "f", type: "nominal" },
    size: { condition: { test: "datum.t > 0.3", value: 30 }, value: 8 },
    opacity: { value: 0.8 },
    description: { field: "c" },
  },
  config: { aria: true },
};

describe("compiled expressions match vega-interpreter", () => {
  it("for a spec exercising operators, literals, members, conditionals and functions", async () => {
    const data = { trace: scatterRows(300) };
    const ours = await svgWith(compiledExpressions, features, data);
    expect(ours).toBe(await svgWith(expressionInterpreter, features, data));
    expect(ours).toContain("aria-label");
  });

  it("for every builder template", async () => {
    for (const t of FIGURE_TEMPLATES) {
      const spec = t.build({ sigmaField: "sigma" });
      expect(await svgWith(compiledExpressions, spec, TEMPLATE_DATA), t.id).toBe(await svgWith(expressionInterpreter, spec, TEMPLATE_DATA));
    }
  });
});

describe("compiled expressions keep vega-interpreter's refusals", () => {
  const param = (src: string) => compiledExpressions.parameter({ functions: {} }, { ast: vega.parseExpression(src) }) as (d: unknown, p: unknown) => unknown;

  it("never hand out Function, eval or timers through member access", () => {
    const quiet = vi.spyOn(console, "error").mockImplementation(() => undefined);
    try {
      for (const f of [Function, eval, setTimeout, setInterval]) expect(param("datum.f")({ f }, {})).toBeUndefined();
      expect(param("datum['f']")({ f: Function }, {})).toBeUndefined();
      expect(param("datum.g")({ g: 42 }, {})).toBe(42);
    } finally {
      quiet.mockRestore();
    }
  });

  it("drop prototype keys and dangerous values from object literals", () => {
    const quiet = vi.spyOn(console, "error").mockImplementation(() => undefined);
    try {
      const o = param("{toString: datum.f, valueOf: datum.f, ok: 1, then: 2}")({ f: () => "x" }, {}) as Record<string, unknown>;
      expect(Object.prototype.hasOwnProperty.call(o, "toString")).toBe(false);
      expect(Object.prototype.hasOwnProperty.call(o, "valueOf")).toBe(false);
      expect(Object.prototype.hasOwnProperty.call(o, "then")).toBe(false);
      expect(o.ok).toBe(1);
      expect(param("{k: datum.f}")({ f: setTimeout }, {})).toEqual({});
    } finally {
      quiet.mockRestore();
    }
  });
});
