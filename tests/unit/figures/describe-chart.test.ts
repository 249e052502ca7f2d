import { describe, expect, it } from "vitest";
import { describeChart } from "@/lib/figures/describe-chart";

// Every expected string below is written out by hand: it is what a screen reader should say.

const tau = { field: "tau", type: "quantitative", title: "τ (µs)" };

describe("describeChart: a chart's text alternative", () => {
  it("names a single scatter plot by its title and says axes and rows", () => {
    const spec = {
      title: "Hahn echo, NV09",
      data: { name: "echo" },
      mark: "point",
      encoding: { x: tau, y: { field: "signal", type: "quantitative", title: "echo amplitude" } },
    };
    expect(describeChart(spec, { echo: 24 })).toEqual({
      name: "Hahn echo, NV09",
      description: "Scatter plot of echo amplitude against τ (µs). Data: 24 rows of “echo”.",
    });
  });

  it("falls back to field names (escapes removed, aggregates said) when there is no title", () => {
    const spec = {
      data: { name: "runs" },
      mark: { type: "line", strokeWidth: 1 },
      encoding: { x: { field: "t\\.start", type: "quantitative" }, y: { field: "T2", aggregate: "mean", type: "quantitative" } },
    };
    expect(describeChart(spec, { runs: 1 })).toEqual({
      name: "Line chart of mean of T2 against t.start",
      description: "Line chart of mean of T2 against t.start. Data: 1 row of “runs”.",
    });
  });

  it("reads an axis title, and a field when both titles are null", () => {
    const spec = {
      data: { name: "d" },
      mark: "bar",
      encoding: {
        x: { field: "depth", type: "quantitative", axis: { title: "depth (nm)" } },
        y: { field: "count", type: "quantitative", title: null, axis: { title: null } },
      },
    };
    expect(describeChart(spec, { d: 0 }).description).toBe("Bar chart of count against depth (nm). Data: no rows of “d”.");
  });

  it("lists the kinds of a layered view, inherits the parent's encoding, and says fitted values", () => {
    const spec = {
      data: { name: "echo" },
      encoding: { x: tau, y: { field: "signal", type: "quantitative", title: "coherence" } },
      layer: [
        { mark: { type: "errorbar" }, encoding: { yError: { field: "sigma" } } },
        { mark: "point" },
        { data: { name: "fit" }, mark: { type: "line", color: "#D55E00" }, encoding: { y: { field: "signal_fit", type: "quantitative" } } },
      ],
    };
    expect(describeChart(spec, { echo: 40, fit: 1200 }, ["T2 = 12.3 ± 0.4 µs", "n = 1.8 ± 0.2"])).toEqual({
      name: "Scatter plot, line chart and error bars of coherence and signal_fit against τ (µs)",
      description:
        "Scatter plot, line chart and error bars of coherence and signal_fit against τ (µs). " +
        "Data: 40 rows of “echo”, 1,200 rows of “fit”. " +
        "Fitted values: T2 = 12.3 ± 0.4 µs; n = 1.8 ± 0.2.",
    });
  });

  it("describes stacked plots one by one, with a title object, subtitle, description and log axis", () => {
    const logTau = { ...tau, scale: { type: "log" } };
    const spec = {
      title: { text: ["Hahn echo,", "NV09"], subtitle: "oxygen-terminated surface" },
      description: "Decay curve of coherence against τ",
      vconcat: [
        {
          layer: [
            { data: { name: "echo" }, mark: "point", encoding: { x: logTau, y: { field: "signal", type: "quantitative", title: "coherence" } } },
            { data: { name: "fit" }, mark: "line", encoding: { x: logTau, y: { field: "signal", type: "quantitative", title: "coherence" } } },
          ],
        },
        {
          title: "residuals",
          data: { name: "residuals" },
          layer: [
            { mark: "rule", encoding: { y: { datum: 0, type: "quantitative" } } },
            { mark: "point", encoding: { x: logTau, y: { field: "signal", type: "quantitative", title: "residual" } } },
          ],
        },
      ],
    };
    expect(describeChart(spec, { echo: 24, fit: 200, residuals: 24 })).toEqual({
      name: "Hahn echo, NV09",
      description:
        "Oxygen-terminated surface. Decay curve of coherence against τ. Two plots stacked vertically. " +
        "Plot 1: scatter plot and line chart of coherence against τ (µs) on a log scale. " +
        "Plot 2 (“residuals”): scatter plot and rule lines of residual against τ (µs) on a log scale. " +
        "Data: 24 rows of “echo”, 200 rows of “fit”, 24 rows of “residuals”.",
    });
  });

  it("names an untitled composite by its count, arrangement and axes", () => {
    const unit = (y: string) => ({ data: { name: "pop" }, mark: "point", encoding: { x: { field: "depth" }, y: { field: y } } });
    const spec = { hconcat: [unit("T1"), unit("T2"), { data: { name: "pop" }, mark: "bar", encoding: { x: { field: "sample" } } }] };
    expect(describeChart(spec, { pop: 12 })).toEqual({
      name: "Three plots side by side: T1 and T2 against depth and sample",
      description:
        "Three plots side by side. Plot 1: scatter plot of T1 against depth. Plot 2: scatter plot of T2 against depth. " +
        "Plot 3: bar chart along sample. Data: 12 rows of “pop”.",
    });
  });

  it("says small multiples for the facet operator and for a row channel, and an unbound name", () => {
    const faceted = {
      data: { name: "pop" },
      facet: { field: "sample", type: "nominal", title: "Sample" },
      spec: { mark: "bar", encoding: { x: { field: "group", type: "nominal" }, y: { aggregate: "count", type: "quantitative" } } },
    };
    expect(describeChart(faceted)).toEqual({
      name: "Bar chart of count against group, in small multiples by Sample",
      description: "Bar chart of count against group, in small multiples by Sample. Data: nothing bound to “pop”.",
    });
    const rows = {
      data: { name: "pop" },
      mark: "tick",
      encoding: { x: { field: "T2", title: "T₂ (µs)" }, row: { field: "sample", header: { title: "sample" } } },
    };
    expect(describeChart(rows, { pop: 3 }).name).toBe("Tick marks along T₂ (µs), in small multiples by sample");
  });

  it("resolves repeated fields", () => {
    const spec = {
      data: { name: "pop" },
      repeat: ["T1", "T2"],
      spec: { mark: "circle", encoding: { x: { field: "depth", title: "depth (nm)" }, y: { field: { repeat: "repeat" }, type: "quantitative" } } },
    };
    expect(describeChart(spec, { pop: 5 }).description).toBe("Scatter plot of T1 / T2 against depth (nm), repeated for T1 and T2. Data: 5 rows of “pop”.");
  });

  it("calls a rect with a colour a heatmap and says what the colour shows", () => {
    const spec = {
      data: { name: "map" },
      mark: { type: "rect" },
      encoding: {
        x: { field: "x", title: "x (µm)" },
        y: { field: "y", title: "y (µm)" },
        color: { field: "rate", type: "quantitative", legend: { title: "count rate (kcounts/s)" } },
      },
    };
    expect(describeChart(spec, { map: 2500 }).description).toBe(
      "Heatmap of y (µm) against x (µm), coloured by count rate (kcounts/s). Data: 2,500 rows of “map”.",
    );
  });

  it("counts rows written inline and does not repeat a colour that is already an axis", () => {
    const x = { field: "wl", title: "wavelength (nm)" };
    const spec = {
      layer: [
        { data: { name: "spectrum" }, mark: "line", encoding: { x, y: { field: "counts", title: "PL (counts)" } } },
        { data: { values: [{ wl: 637 }, { wl: 575 }] }, mark: "rule", encoding: { x } },
        { data: { values: [{ wl: 637, line: "ZPL" }] }, mark: "text", encoding: { x, color: { field: "line" } } },
      ],
    };
    expect(describeChart(spec, { spectrum: 500 })).toEqual({
      name: "Line chart, rule lines and text labels of PL (counts) against wavelength (nm), coloured by line",
      description:
        "Line chart, rule lines and text labels of PL (counts) against wavelength (nm), coloured by line. " +
        "Data: 500 rows of “spectrum”, 3 rows written in the spec.",
    });
    const same = { data: { name: "pop" }, mark: "point", encoding: { x: { field: "sample" }, y: { field: "T2" }, color: { field: "sample" } } };
    expect(describeChart(same, { pop: 4 }).name).toBe("Scatter plot of T2 against sample");
    const titled = { ...same, encoding: { ...same.encoding, x: { field: "sample", title: "sample group" } } };
    expect(describeChart(titled, { pop: 4 }).name).toBe("Scatter plot of T2 against sample group");
  });

  it("counts named datasets written in the spec when the caller gives no count", () => {
    const spec = { datasets: { pts: [{ a: 1 }, { a: 2 }, { a: 3 }] }, data: { name: "pts" }, mark: "area", encoding: { x: { field: "a" } } };
    expect(describeChart(spec).description).toBe("Area chart along a. Data: 3 rows of “pts”.");
  });

  it("says unknown marks by their type and copes with specs that are not objects", () => {
    expect(describeChart({ mark: "wedge" }).name).toBe("Wedge marks");
    expect(describeChart({}).name).toBe("Empty plot");
    expect(describeChart(null)).toEqual({ name: "Chart", description: "The chart's spec could not be read." });
    expect(describeChart([1, 2])).toEqual({ name: "Chart", description: "The chart's spec could not be read." });
  });
});
