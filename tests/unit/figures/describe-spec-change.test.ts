import { describe, expect, it } from "vitest";
import { describeSpecChange, type BoundSource } from "@/lib/figures/describe-spec-change";

const base = {
  $schema: "https://vega.github.io/schema/vega-lite/v6.json",
  data: { name: "echo" },
  width: 300,
  height: 200,
  mark: "point",
  encoding: {
    x: { field: "tau", type: "quantitative", title: "τ (µs)" },
    y: { field: "signal", type: "quantitative", title: "echo amplitude" },
  },
  transform: [{ filter: "datum.tau > 0" }, { calculate: "datum.signal / 2", as: "half" }],
  config: { font: "Inter", axis: { labelFontSize: 7 } },
};
const clone = <T>(v: T): T => JSON.parse(JSON.stringify(v)) as T;
const texts = (before: unknown, after: unknown) => describeSpecChange({ spec: before }, { spec: after }).map((c) => c.text);

describe("describeSpecChange: the spec in words", () => {
  it("says nothing when the specs are equal, key order aside", () => {
    const reordered = Object.fromEntries(Object.entries(base).reverse());
    expect(describeSpecChange({ spec: base }, { spec: reordered })).toEqual([]);
  });

  it("names axis titles, marks, sizes and scales plainly", () => {
    const after = clone(base) as Record<string, unknown> & typeof base;
    after.encoding.y.title = "normalised echo";
    after.mark = "line";
    after.width = 320;
    (after.encoding.y as Record<string, unknown>).scale = { type: "log" };
    expect(texts(base, after)).toEqual([
      "width: 300 → 320",
      "mark: point → line",
      'axis title of y: "echo amplitude" → "normalised echo"',
      "added scale settings of y (with type)",
    ]);
  });

  it("tells a scale type, an axis property and a legend title apart", () => {
    const before = {
      mark: "point",
      encoding: { y: { field: "s", scale: { type: "linear" }, axis: { tickCount: 5 } }, color: { field: "series", title: "run" } },
    };
    const after = {
      mark: "point",
      encoding: { y: { field: "s", scale: { type: "log" }, axis: { tickCount: 4 } }, color: { field: "series", title: "sample" } },
    };
    expect(texts(before, after)).toEqual(["axis tick count of y: 5 → 4", "scale of y: linear → log", 'legend title of color: "run" → "sample"']);
  });

  it("reads a mark written as a word or as an object as the same mark", () => {
    expect(texts({ mark: "point" }, { mark: { type: "point", filled: true } })).toEqual(["added mark filled (true)"]);
    expect(texts({ mark: { type: "point", size: 9 } }, { mark: "line" })).toEqual(["mark: point → line", "removed mark size (9)"]);
  });

  it("describes added and removed channels and transforms by what they do", () => {
    const after = clone(base) as typeof base & { encoding: Record<string, unknown> };
    after.encoding.color = { field: "series", type: "nominal" };
    after.transform = [base.transform[0]];
    expect(texts(base, after)).toEqual(["added encoding color (field series)", "removed transform 2 (calculate datum.signal / 2 as half)"]);
    const filtered = clone(base);
    filtered.transform[0].filter = "datum.tau > 1";
    expect(texts(base, filtered)).toEqual(['filter in transform 1: "datum.tau > 0" → "datum.tau > 1"']);
  });

  it("writes house-style settings in words", () => {
    const after = clone(base);
    after.config.font = "Arial";
    after.config.axis.labelFontSize = 8;
    expect(texts(base, after)).toEqual(["axis label font size (house style): 7 → 8", 'font (house style): "Inter" → "Arial"']);
  });

  it("numbers layers from 1 and tells one change made in several layers once", () => {
    const layer = (name: string, mark: string) => ({ data: { name }, mark, encoding: { y: { field: "v", title: "coherence" } } });
    const before = { vconcat: [{ layer: [layer("echo", "point"), layer("fit", "line")] }, { layer: [layer("residuals", "point")] }] };
    const after = clone(before);
    for (const l of after.vconcat[0].layer) l.encoding.y.title = "normalised echo";
    after.vconcat[1].layer[0].mark = "tick";
    expect(texts(before, after)).toEqual([
      'axis title of y in layers 1 and 2 of plot 1: "coherence" → "normalised echo"',
      "mark in layer 1 of plot 2: point → tick",
    ]);
  });

  it("sees a layer put in between as one added layer, not as every later layer changed", () => {
    const before = {
      layer: [
        { data: { name: "echo" }, mark: "point" },
        { data: { name: "fit" }, mark: "line" },
      ],
    };
    const after = { layer: [before.layer[0], { data: { name: "bounds" }, mark: "rule" }, before.layer[1]] };
    expect(texts(before, after)).toEqual(['added layer 2 (mark rule, data "bounds")']);
    const edited = {
      layer: [
        { data: { name: "echo" }, mark: "circle" },
        { data: { name: "fit" }, mark: "line" },
      ],
    };
    expect(texts(before, edited)).toEqual(["mark in layer 1: point → circle"]);
    expect(texts(before, { layer: [before.layer[1]] })).toEqual(['removed layer 1 (mark point, data "echo")']);
  });

  it("falls back to the path from the spec root where there is no plain name", () => {
    const before = { mark: "point", encoding: { size: { value: 3 } } };
    const after = { mark: "point", encoding: { size: { value: 4 } }, params: [{ name: "zoom", bind: "scales" }] };
    const changes = describeSpecChange({ spec: before }, { spec: after });
    expect(changes.map((c) => c.text)).toEqual(["spec.encoding.size.value: 3 → 4", "added spec.params (1 item)"]);
    expect(changes.map((c) => c.kind)).toEqual(["changed", "added"]);
    expect(changes[0].path).toBe("encoding.size.value");
  });

  it("quotes text, writes null as none and keeps long values short", () => {
    const long = "x".repeat(80);
    expect(texts({ encoding: { x: { title: "τ" } } }, { encoding: { x: { title: null } } })).toEqual(['axis title of x: "τ" → none']);
    expect(texts({ description: "a" }, { description: long })).toEqual([`description: "a" → "${"x".repeat(59)}…"`]);
    expect(texts({ encoding: { y: { scale: { domain: [0, 1] } } } }, { encoding: { y: { scale: { domain: [0, 2] } } } })).toEqual([
      "axis range of y: [0, 1] → [0, 2]",
    ]);
  });
});

describe("describeSpecChange: the data in words", () => {
  const version = (id: string, sha: string): BoundSource => ({ kind: "version", id, versionId: id, sha256: sha });
  const fit = (id: string, output: string): BoundSource => ({ kind: "analysis", id, versionId: `derived-${id}`, sha256: `sha-${id}`, output });
  const spec = { mark: "point" };
  const labels = { v1: { datasetId: "d1", number: 1 }, v2: { datasetId: "d1", number: 2 }, v9: { datasetId: "d2", number: 4 } };

  it("names versions by number when known, by file hash otherwise", () => {
    const before = { spec, bound: { echo: version("v1", "a1b2c3d4e5f6") } };
    expect(describeSpecChange(before, { spec, bound: { echo: version("v2", "0f1e2d3c4b5a") } }, labels).map((c) => c.text)).toEqual([
      'data "echo": version 1 → 2',
    ]);
    expect(describeSpecChange(before, { spec, bound: { echo: version("v9", "99") } }, labels).map((c) => c.text)).toEqual([
      'data "echo": version 1 → version 4 of another dataset',
    ]);
    expect(describeSpecChange(before, { spec, bound: { echo: version("v2", "0f1e2d3c4b5a") } }).map((c) => c.text)).toEqual([
      'data "echo": file a1b2c3d4 → file 0f1e2d3c',
    ]);
  });

  it("says which output of a stored fit, and when data is added or dropped", () => {
    const before = { spec, bound: { echo: version("v1", "aa"), fit: fit("a1", "curve") } };
    const after = { spec, bound: { fit: fit("a1", "residuals"), extra: version("v2", "bb") } };
    const changes = describeSpecChange(before, after, labels);
    expect(changes.map((c) => [c.kind, c.text, c.path])).toEqual([
      ["removed", 'removed data "echo" (version 1)', "bindings.echo"],
      ["added", 'added data "extra" (version 2)', "bindings.extra"],
      ["changed", 'data "fit": fitted curve → residuals', "bindings.fit"],
    ]);
    expect(describeSpecChange({ spec, bound: { fit: fit("a1", "curve") } }, { spec, bound: { fit: fit("a2", "curve") } }).map((c) => c.text)).toEqual([
      'data "fit": a different stored fit (fitted curve)',
    ]);
  });

  it("puts the spec's changes before the data's", () => {
    const changes = describeSpecChange(
      { spec: { mark: "point" }, bound: { echo: version("v1", "aa") } },
      { spec: { mark: "line" }, bound: { echo: version("v2", "bb") } },
      labels,
    );
    expect(changes.map((c) => c.text)).toEqual(["mark: point → line", 'data "echo": version 1 → 2']);
  });
});
