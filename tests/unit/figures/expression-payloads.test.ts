/**
 * Expression payloads from published Vega sandbox escapes. Where the payload text was read from
 * the advisory or issue it says "read"; where only the advisory's description was known and the
 * payload is reconstructed, it says "from memory" — those test the same shape, not a verbatim copy.
 */
import { describe, expect, it } from "vitest";
import { checkExpression } from "@/lib/figures/spec-expressions";
import { validateSpec } from "@/lib/figures/validate-spec";

const PAYLOADS: Array<{ source: string; expr: string }> = [
  {
    source: "GHSA-7f2v-3qq3-vvjf / CVE-2025-59840 (2025): toString gadget through event.view.VEGA_DEBUG — read",
    expr: "({toString:event.view.VEGA_DEBUG.vega.CanvasHandler.prototype.on, eventName:event.view.console.log,_handlers:{undefined:'alert(origin + ` XSS on version `+ VEGA_DEBUG.VEGA_VERSION)'},_handlerIndex:event.view.eval})+1",
  },
  {
    source: "GHSA-7f2v-3qq3-vvjf variant without event: a toString key on an object literal — from memory",
    expr: "({toString: datum.f, valueOf: datum.g}) + 1",
  },
  {
    source: "vega/vega#3984, vega-lite#9469 (2024): scale() invoking a function reached through event.view — read",
    expr: "scale(event.view.setTimeout, 'alert(1)')",
  },
  {
    source: "GHSA-4vq7-882g-wcg4 (2023): scale() with a forged group context and [].constructor.constructor — read",
    expr: "scale('func', null, {context: {scales: {func: {value: scale('func', 'eval(atob(\"YWxlcnQoMSk7\"))', {context: {scales: {func: {value: [].constructor.constructor}}}})}}}})",
  },
  {
    source: "vega/vega#3027 (2020): join() calling eval reached via event.target.ownerDocument.defaultView — read",
    expr: "join({'join':event.target.ownerDocument.defaultView.eval},'alert(1)')",
  },
  {
    source: "vega/vega#3027 (2020): replace() with a callable replacement — read",
    expr: "replace('alert(1)',/.*/,event.target.ownerDocument.defaultView.eval)",
  },
  {
    source: "vega/vega#3018, vega-lite#7122 (2020): comment/regex/line-continuation parser confusion in a filter — read",
    expr: "(0//1/)-'\\\n,alert(1))))//'",
  },
  {
    source: "CVE-2025-25304 (2025): vlSelectionTuples calling attacker-supplied functions — from memory",
    expr: "vlSelectionTuples([{}], {fields: [{getter: datum.f}], unit: ''})",
  },
  {
    source: "CVE-2025-66648 / GHSA-m9rg-mr6g-75gm (2025): setdata with a crafted object — from memory",
    expr: "setdata('data_0', {toString: datum.f})",
  },
  {
    source: "GHSA-w5m3-xh75-mp55 (2023): lassoAppend pushing onto a forged object — from memory",
    expr: "lassoAppend({push: datum.f}, 'alert(1)', 0)",
  },
  { source: "copy() of a scale with a forged context — from memory", expr: "copy('x', {context: {scales: {x: {value: datum.f}}}})" },
  { source: "bracket access to constructor — from memory", expr: "datum['constructor']['constructor']('alert(1)')()" },
  { source: "bracket access built by concatenation", expr: "datum['constr' + 'uctor']" },
  { source: "bracket access hidden by a hex escape", expr: "datum['\\x63onstructor']" },
  { source: "bracket access hidden by a unicode escape", expr: 'datum["\\u005f_proto__"]' },
  { source: "prototype via dot", expr: "datum.__proto__.polluted" },
  { source: "toString reached by dot", expr: "datum.x.toString.constructor('alert(1)')()" },
  { source: "global window", expr: "window.location" },
  { source: "global document", expr: "document.cookie" },
  { source: "this", expr: "this.context" },
  { source: "eval", expr: "eval('1')" },
  { source: "Function", expr: "Function('return 1')()" },
  { source: "dynamic import", expr: "import('data:text/javascript,alert(1)')" },
  { source: "setTimeout", expr: "setTimeout('alert(1)', 0)" },
  { source: "template literal", expr: "`${datum.x}`" },
  { source: "assignment", expr: "datum.x = 1" },
  { source: "arrow function", expr: "sort(datum.list, (a) => a)" },
  { source: "event in a plain expression", expr: "event.view" },
];

describe("expression payloads are refused", () => {
  for (const { source, expr } of PAYLOADS) {
    it(source.length > 90 ? `${source.slice(0, 87)}…` : source, () => {
      expect(checkExpression(expr), expr).not.toBeNull();
      const spec = {
        data: { name: "d" },
        mark: "point",
        transform: [{ calculate: expr, as: "z" }],
        encoding: { x: { field: "x", type: "quantitative" } },
      };
      const r = validateSpec(spec);
      expect(r.ok).toBe(false);
      if (!r.ok) expect(r.errors[0]).toMatchObject({ path: "transform[0].calculate", message: expect.stringMatching(/^expression refused: /) });
    });
  }
});

describe("expressions are checked wherever Vega-Lite takes one", () => {
  const bad = "event.view.alert(1)";
  const base = { data: { name: "d" }, mark: "point", encoding: { x: { field: "x", type: "quantitative" } } };
  const cases: Array<[string, Record<string, unknown>]> = [
    ["params[0].expr", { params: [{ name: "p", expr: bad }] }],
    ["params[0].value.expr", { params: [{ name: "p", value: { expr: bad } }] }],
    ["transform[0].filter", { transform: [{ filter: bad }] }],
    ["transform[0].filter.and[1]", { transform: [{ filter: { and: ["datum.x > 0", bad] } }] }],
    ["mark.size.expr", { mark: { type: "point", size: { expr: bad } } }],
    ["encoding.x.axis.labelExpr", { encoding: { x: { field: "x", type: "quantitative", axis: { labelExpr: bad } } } }],
    [
      "encoding.color.condition.test",
      { encoding: { x: { field: "x", type: "quantitative" }, color: { condition: { test: bad, value: "red" }, value: "blue" } } },
    ],
    ["config.axis.labelExpr", { config: { axis: { labelExpr: bad } } }],
    ["params[0].select.toggle", { params: [{ name: "s", select: { type: "point", toggle: "event.shiftKey" } }] }],
    ["params[0].select.on", { params: [{ name: "s", select: { type: "point", on: "click[scale(event.view.setTimeout, 'alert(1)')]" } }] }],
    ["layer[1].transform[0].calculate", { layer: [{ mark: "point" }, { mark: "line", transform: [{ calculate: bad, as: "y" }] }], mark: undefined }],
  ];
  for (const [path, extra] of cases) {
    it(path, () => {
      const r = validateSpec({ ...base, ...extra });
      expect(r.ok).toBe(false);
      if (!r.ok) expect(r.errors.map((e) => e.path)).toContain(path);
    });
  }

  it("a parameter cannot take the name of a forbidden global", () => {
    const r = validateSpec({ ...base, params: [{ name: "window", value: 1 }], transform: [{ calculate: "window.location", as: "y" }] });
    expect(r.ok).toBe(false);
  });

  it("field names that reach prototypes", () => {
    const r = validateSpec({ ...base, transform: [{ calculate: "1", as: "__proto__" }] });
    expect(r.ok).toBe(false);
    const r2 = validateSpec({ ...base, encoding: { x: { field: "a.constructor", type: "quantitative" } } });
    expect(r2.ok).toBe(false);
  });

  it("plain event names and boolean toggles stay allowed", () => {
    const r = validateSpec({ ...base, params: [{ name: "s", select: { type: "point", on: "pointerover", clear: "pointerout", toggle: false } }] });
    expect(r).toMatchObject({ ok: true });
  });
});

describe("checkExpression accepts ordinary figure expressions", () => {
  it.each([
    "datum.tau * 1e3",
    "datum['count rate'] / 1000",
    "log(datum.y) / LN10",
    "datum.series === 'curve' || datum.series == \"data\"",
    "isValid(datum.x) ? datum.x : NaN",
    "format(datum.T2, '.3~g') + ' µs'",
    "[1, 2, 3][0] + {a: 1}.a",
    "-datum.x ** 2 >= .5 && !(datum.y < 0)",
    "a ? .5 : 1",
    "timeFormat(datum.t, '%Y-%m-%d')",
  ])("%s", (expr) => {
    expect(checkExpression(expr, new Set(["a"]))).toBeNull();
  });
});
