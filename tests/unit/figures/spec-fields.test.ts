import { describe, expect, it } from "vitest";
import { checkSpecFields, columnOfField, specFields, specFieldUses, suggestColumn } from "@/lib/figures/spec-fields";
import { datumFields } from "@/lib/figures/spec-expressions";
import { decayCurveTemplate } from "@/lib/figures/templates";
import { HEADER_UNIT_RULE, parseHeaderUnit } from "@/lib/data/units";

describe("the fields a spec reads, per data name", () => {
  it("a single view: encodings with nested defs, tooltip arrays, sort and conditions", () => {
    const spec = {
      data: { name: "echo" },
      mark: "point",
      encoding: {
        x: { field: "tau", type: "quantitative" },
        y: { field: "signal", type: "quantitative", sort: { field: "order", op: "min" } },
        color: { field: "run", type: "nominal", condition: { test: "datum.flag > 0", value: "red" } },
        size: { condition: { param: "sel", field: "weight", type: "quantitative" }, value: 2 },
        tooltip: [
          { field: "note", type: "nominal" },
          { field: "sigma", type: "quantitative" },
        ],
        text: { field: "label", type: "nominal" },
        detail: [{ field: "group", type: "nominal" }],
        order: { field: "seq", type: "quantitative" },
        shape: { aggregate: { argmax: "peak" }, field: "kind", type: "nominal" },
      },
    };
    expect(specFields(spec)).toEqual({ echo: ["flag", "group", "kind", "label", "note", "order", "peak", "run", "seq", "sigma", "signal", "tau", "weight"] });
  });

  it("layers inherit data, transforms and encoding; a layer with its own data starts afresh", () => {
    const spec = {
      data: { name: "echo" },
      transform: [{ calculate: "datum.signal * 2", as: "double" }],
      encoding: { x: { field: "tau", type: "quantitative" } },
      layer: [
        { mark: "point", encoding: { y: { field: "double", type: "quantitative" } } },
        {
          data: { name: "fit" },
          transform: [{ filter: "datum.series === 'curve'" }],
          mark: "line",
          encoding: { y: { field: "double", type: "quantitative" } },
        },
        { data: { values: [{ a: 1 }] }, mark: "rule", encoding: { y: { field: "a", type: "quantitative" } } },
      ],
    };
    // `double` exists for echo (calculated) but not for fit; the inline layer is not checked.
    expect(specFields(spec)).toEqual({ echo: ["signal", "tau"], fit: ["double", "series", "tau"] });
  });

  it("transforms: filter predicates, calculate with datum['a b'], aggregate, window, bin, timeUnit, lookup; created fields are not reported", () => {
    const spec = {
      data: { name: "d" },
      transform: [
        { filter: { and: [{ field: "temp", gt: 4 }, { not: "datum['run id'] == 3" }, { or: [{ field: "ok", equal: true }, "datum.alt > 1"] }] } },
        { calculate: 'datum["a b"] + datum.c', as: "sum" },
        {
          aggregate: [
            { op: "mean", field: "sum", as: "mean_sum" },
            { op: "count", as: "n" },
          ],
          groupby: ["grp"],
        },
        {
          window: [
            { op: "rank", as: "rank" },
            { op: "sum", field: "w", as: "cum" },
          ],
          sort: [{ field: "t" }],
          groupby: ["grp"],
        },
        { bin: true, field: "x", as: "x_bin" },
        { timeUnit: "month", field: "date", as: "month" },
        { lookup: "key", from: { data: { name: "meta" }, key: "id", fields: ["label", "colour"] } },
      ],
      mark: "bar",
      encoding: {
        x: { field: "x_bin", type: "quantitative" },
        x2: { field: "x_bin_end" },
        y: { field: "mean_sum", type: "quantitative" },
        color: { field: "label", type: "nominal" },
        opacity: { field: "cum", type: "quantitative" },
        column: { field: "month", type: "ordinal" },
        tooltip: [{ field: "n" }, { field: "rank" }, { field: "colour" }],
      },
    };
    expect(specFields(spec)).toEqual({
      d: ["a b", "alt", "c", "date", "grp", "key", "ok", "run id", "t", "temp", "w", "x"],
      meta: ["colour", "id", "label"],
    });
  });

  it("fold, density, regression, loess, quantile, flatten and stack: inputs reported, outputs (named or default) not", () => {
    const spec = {
      data: { name: "d" },
      vconcat: [
        { transform: [{ fold: ["a", "b"] }], mark: "line", encoding: { x: { field: "key" }, y: { field: "value", type: "quantitative" } } },
        { transform: [{ fold: ["c"], as: ["k", "v"] }], mark: "line", encoding: { x: { field: "k" }, y: { field: "v" }, color: { field: "key" } } },
        { transform: [{ density: "e", groupby: ["g"] }], mark: "area", encoding: { x: { field: "value" }, y: { field: "density" } } },
        { transform: [{ regression: "y1", on: "x1", as: ["rx", "ry"] }], mark: "line", encoding: { x: { field: "rx" }, y: { field: "ry" } } },
        { transform: [{ loess: "y2", on: "x2", groupby: ["g2"] }], mark: "line", encoding: { x: { field: "x2" }, y: { field: "y2" } } },
        { transform: [{ quantile: "q" }], mark: "point", encoding: { x: { field: "prob" }, y: { field: "value" } } },
        { transform: [{ flatten: ["list"], as: ["item"] }], mark: "point", encoding: { x: { field: "item" } } },
        {
          transform: [{ stack: "s", groupby: ["sg"], as: "st", sort: [{ field: "so" }] }],
          mark: "bar",
          encoding: { y: { field: "st" }, y2: { field: "st_end" } },
        },
      ],
    };
    // the second view reads `key`, which its fold (named k, v) does not create.
    expect(specFields(spec)).toEqual({ d: ["a", "b", "c", "e", "g", "g2", "key", "list", "q", "s", "sg", "so", "x1", "x2", "y1", "y2"] });
  });

  it("repeat references resolve to the repeat lists; facet fields are read", () => {
    const spec = {
      data: { name: "odmr" },
      repeat: { row: ["pl", "contrast"], column: ["frequency"] },
      spec: { mark: "line", encoding: { x: { field: { repeat: "column" }, type: "quantitative" }, y: { field: { repeat: "row" }, type: "quantitative" } } },
    };
    expect(specFields(spec)).toEqual({ odmr: ["contrast", "frequency", "pl"] });
    const arrayRepeat = {
      data: { name: "d" },
      repeat: ["a", "b"],
      spec: { mark: "point", encoding: { x: { field: { repeat: "repeat" } }, y: { field: "c" } } },
    };
    expect(specFields(arrayRepeat)).toEqual({ d: ["a", "b", "c"] });
    const facet = {
      data: { name: "d" },
      facet: { row: { field: "sample" }, column: { field: "run", sort: { field: "when" } } },
      spec: { mark: "point", encoding: { x: { field: "t" } } },
    };
    expect(specFields(facet)).toEqual({ d: ["run", "sample", "t", "when"] });
  });

  it("after a pivot any name may be a column; inline datasets and unbound views are not checked", () => {
    const spec = {
      datasets: { inline: [{ z: 1 }] },
      hconcat: [
        {
          data: { name: "d" },
          transform: [{ pivot: "channel", value: "v", groupby: ["t"] }],
          mark: "line",
          encoding: { x: { field: "t" }, y: { field: "ch1" } },
        },
        { data: { name: "inline" }, mark: "point", encoding: { x: { field: "z" } } },
        { mark: "point", encoding: { x: { field: "nowhere" } } },
      ],
    };
    expect(specFields(spec)).toEqual({ d: ["channel", "t", "v"] });
  });

  it("field paths: a.b and a[0] read a; escaped dots are part of the name", () => {
    expect(["a.b", "a[0]", "a\\.b", "tau (µs)", "x\\[1\\]"].map(columnOfField)).toEqual(["a", "a", "a.b", "tau (µs)", "x[1]"]);
    expect(datumFields("datum.a + datum['b c'] * datum[\"d.e\"] - datum.f.g + abs(datum.h)")).toEqual(["a", "b c", "d.e", "f", "h"]);
  });

  it("marks raw quantitative position fields as continuous (their null rows are dropped)", () => {
    const spec = {
      data: { name: "d" },
      mark: "point",
      encoding: {
        x: { field: "t", type: "quantitative" },
        y: { field: "s", type: "quantitative", aggregate: "mean" },
        color: { field: "c", type: "quantitative" },
        y2: { field: "s2", type: "temporal" },
      },
    };
    expect(specFieldUses(spec).map((u) => [u.field, u.channel, u.continuous, u.path.join("/")])).toEqual([
      ["t", "x", true, "encoding/x/field"],
      ["s", "y", false, "encoding/y/field"],
      ["c", "color", false, "encoding/color/field"],
      ["s2", "y2", true, "encoding/y2/field"],
    ]);
  });
});

describe("fields the bound data lacks", () => {
  const echo = [
    { name: "t", unit: "µs", header: "t_us" },
    { name: "signal", unit: null, header: "signal" },
    { name: "sigma", unit: null, header: "sigma" },
  ];

  it("names the field, the data, the columns and the column the header became", () => {
    const spec = {
      data: { name: "echo" },
      mark: "point",
      encoding: { x: { field: "t_us", type: "quantitative" }, y: { field: "signal", type: "quantitative" } },
    };
    expect(checkSpecFields(spec, { echo })).toEqual([
      {
        dataName: "echo",
        field: "t_us",
        written: "t_us",
        channel: "x",
        path: "encoding.x.field",
        pointer: "/encoding/x/field",
        columns: ["t", "signal", "sigma"],
        suggestion: { column: "t", reason: "header", write: "t", text: "Did you mean `t` (the column made from the header `t_us`)?" },
        message: "the field `t_us` is not a column of the data `echo` (columns: t, signal, sigma). Did you mean `t` (the column made from the header `t_us`)?",
      },
    ]);
  });

  it("suggests by the unit rule when the header is not recorded, by case, by escaping and by nearest name", () => {
    const old = [
      { name: "t", unit: "µs" },
      { name: "Signal", unit: null },
      { name: "a.b", unit: null },
      { name: "sigma", unit: null },
    ];
    expect(suggestColumn("t (us)", "t (us)", old)?.text).toBe("Did you mean `t` (units are split off headers: `t (us)` becomes the column `t` with unit µs)?");
    expect(suggestColumn("signal", "signal", old)?.text).toBe("Did you mean `Signal` (field names are case-sensitive)?");
    expect(suggestColumn("a.b", "a", old)?.text).toBe(
      "Did you mean `a\\.b` (a `.` or `[` in a field reads a nested property unless escaped with a backslash)?",
    );
    expect(suggestColumn("sigam", "sigam", old)).toMatchObject({ column: "sigma", reason: "near", text: "Did you mean `sigma`?" });
    expect(suggestColumn("phase", "phase", old)).toBeNull();
  });

  it("reports each missing field of a data name once, and never data names it is not given", () => {
    const spec = {
      layer: [
        { data: { name: "echo" }, mark: "point", encoding: { x: { field: "tau" }, y: { field: "tau" } } },
        { data: { name: "fit" }, mark: "line", encoding: { x: { field: "anything" } } },
      ],
    };
    expect(checkSpecFields(spec, { echo }).map((p) => [p.dataName, p.field, p.path, p.suggestion])).toEqual([
      ["echo", "tau", "layer[0].encoding.x.field", null],
    ]);
  });
});

describe("the templates and the header rule", () => {
  it("the decay-curve template reads the echo columns, and the fit's and residuals' series", () => {
    expect(specFields(decayCurveTemplate.build({ sigmaField: "sigma" }))).toEqual({
      echo: ["sigma", "signal", "tau"],
      fit: ["series", "signal", "tau"],
      residuals: ["series", "signal", "tau"],
    });
  });

  it("the examples in the dataset page's one-line rule hold", () => {
    expect(HEADER_UNIT_RULE).toContain("“time (µs)” → column time, unit µs");
    expect(parseHeaderUnit("time (µs)")).toEqual({ name: "time", unit: "µs" });
    expect(HEADER_UNIT_RULE).toContain("“t_us” → t, µs; “run_id” and “counts/s” stay whole");
    expect([parseHeaderUnit("t_us"), parseHeaderUnit("run_id"), parseHeaderUnit("counts/s")]).toEqual([
      { name: "t", unit: "µs" },
      { name: "run_id", unit: null },
      { name: "counts/s", unit: null },
    ]);
    expect(parseHeaderUnit("B [mT]")).toEqual({ name: "B", unit: "mT" });
    expect(parseHeaderUnit("f / whatever")).toEqual({ name: "f", unit: "whatever" });
    expect(parseHeaderUnit("f/whatever")).toEqual({ name: "f/whatever", unit: null });
  });
});
