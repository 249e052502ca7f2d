import { describe, expect, it } from "vitest";
import { DECAY_CURVE_DEFAULTS, expectedNucleusMarker, FIGURE_TEMPLATES, getTemplate, PRINT_OPTION_FIELDS, axisTitle } from "@/lib/figures/templates";

type Json = Record<string, any>;
const build = (id: string, options: Record<string, unknown> = {}): Json => getTemplate(id)!.build(options) as unknown as Json;

/** Every object in the spec tree that has the key. */
function collect(node: unknown, key: string, out: unknown[] = []): unknown[] {
  if (Array.isArray(node)) node.forEach((n) => collect(n, key, out));
  else if (node && typeof node === "object") {
    for (const [k, v] of Object.entries(node)) {
      if (k === key) out.push(v);
      collect(v, key, out);
    }
  }
  return out;
}

describe("builder templates", () => {
  it("cover the field's plots with unique ids, titles and an option form", () => {
    expect(FIGURE_TEMPLATES.map((t) => t.id)).toEqual(["decay-curve", "spectrum", "pl-map", "group-strip", "nv-nmr", "scatter-line", "pulse-scaling"]);
    for (const t of FIGURE_TEMPLATES) {
      expect(t.title.length).toBeGreaterThan(5);
      expect(t.description.length).toBeGreaterThan(20);
      const keys = t.options.map((o) => o.key);
      expect(new Set(keys).size).toBe(keys.length);
      expect(t.options.some((o) => o.kind === "data-name" && o.required)).toBe(true);
      for (const o of t.options) if (o.kind === "column") expect(keys).toContain(o.dataKey);
    }
    expect(PRINT_OPTION_FIELDS.map((f) => f.key)).toEqual([
      "print.widthMm",
      "print.heightMm",
      "print.labelPt",
      "print.titlePt",
      "print.xFormat",
      "print.yFormat",
    ]);
  });

  it("produce Vega-Lite v6 with Inter at 7 pt labels and 8 pt titles and the Okabe–Ito palette", () => {
    for (const t of FIGURE_TEMPLATES) {
      const spec = t.build({}) as unknown as Json;
      expect(spec.$schema).toBe("https://vega.github.io/schema/vega-lite/v6.json");
      expect(spec.config.font).toBe("Inter");
      expect(spec.config.axis).toMatchObject({ labelFontSize: 7, titleFontSize: 8 });
      // Okabe & Ito, "Color Universal Design" (2008), https://jfly.uni-koeln.de/color/; the same eight
      // colours in Wong, Nat. Methods 8, 441 (2011), doi:10.1038/nmeth.1618 (hex values from memory).
      // Order is the project's choice: blue, vermillion, bluish green, orange, reddish purple, sky
      // blue, black, yellow (weak on white paper) last.
      expect(spec.config.range.category).toEqual(["#0072B2", "#D55E00", "#009E73", "#E69F00", "#CC79A7", "#56B4E9", "#000000", "#F0E442"]);
    }
    expect(build("scatter-line", { print: { labelPt: 6, titlePt: 7 } }).config.axis).toMatchObject({ labelFontSize: 6, titleFontSize: 7 });
  });

  it("set tick numbers per axis: plain by default (numberFormat ~f, no thousands separators), a chosen d3 format otherwise", () => {
    const plain = build("scatter-line", {});
    expect(plain.config.numberFormat).toBe("~f");
    expect(plain.config.axisX).toBeUndefined();
    expect(plain.config.axisY).toBeUndefined();
    const chosen = build("decay-curve", { print: { xFormat: ".0e", yFormat: ".2f" } });
    expect(chosen.config.axisX).toEqual({ format: ".0e" });
    expect(chosen.config.axisY).toEqual({ format: ".2f" });
    expect(build("scatter-line", { print: { yFormat: "$,.2f" } }).config.axisY).toBeUndefined(); // not one of the offered styles
  });

  it("size single views to the printed size in pt", () => {
    const spec = build("spectrum", { print: { widthMm: 120, heightMm: 50 } });
    // 1 pt = 1/72 in, 1 in = 25.4 mm: 120 mm × 72/25.4 = 340.157 pt, 50 mm → 141.732 pt.
    expect(spec.width).toBeCloseTo(340.16, 2);
    expect(spec.height).toBeCloseTo(141.73, 2);
    expect(spec.autosize).toEqual({ type: "fit", contains: "padding" });
  });

  it("write units in parentheses in axis titles", () => {
    expect(axisTitle("τ", "µs")).toBe("τ (µs)");
    expect(axisTitle("contrast", "")).toBe("contrast");
    const titles = collect(build("decay-curve"), "title");
    expect(titles).toContain("τ (µs)");
    expect(collect(build("spectrum"), "title")).toEqual(expect.arrayContaining(["wavelength (nm)", "PL intensity (kcounts/s)"]));
    expect(collect(build("pl-map"), "title")).toEqual(expect.arrayContaining(["x (µm)", "y (µm)", "count rate (kcounts/s)"]));
  });

  it("decay curve: points with σ bars, fitted curve, residual strip sharing x, on a log or linear axis", () => {
    const spec = build("decay-curve", { sigmaField: "sigma", xScale: "log" });
    expect(spec.vconcat).toHaveLength(2);
    expect(spec.resolve).toEqual({ scale: { x: "shared" } });
    const top = spec.vconcat[0].layer.map((l: Json) => l.mark.type);
    expect(top).toEqual(["errorbar", "point", "line"]);
    expect(spec.vconcat[0].layer[0].encoding.yError).toEqual({ field: "sigma" });
    expect(spec.vconcat[0].layer[2].transform[0].filter).toBe("datum[\"series\"] === 'curve'");
    expect(spec.vconcat[1].transform[0].filter).toBe("datum[\"series\"] === 'residual'");
    expect(collect(spec, "scale")).toContainEqual(expect.objectContaining({ type: "log" }));
    expect(getTemplate("decay-curve")!.dataNames({ ...DECAY_CURVE_DEFAULTS })).toEqual(["echo", "fit", "residuals"]);
    const noFit = build("decay-curve", { fitName: "", residualName: "" });
    expect(noFit.vconcat).toBeUndefined();
    expect(noFit.layer.map((l: Json) => l.mark.type)).toEqual(["point"]);
    expect(collect(build("decay-curve", { xScale: "symlog" }), "scale")).toContainEqual(expect.objectContaining({ type: "symlog" }));
  });

  it("spectrum: labelled dashed rules at the zero-phonon lines by default", () => {
    const spec = build("spectrum");
    const markers = spec.layer[spec.layer.length - 1];
    // As published: NV⁰ 575 nm, NV⁻ 637 nm (Manson et al., Phys. Rev. B 87, 155209 (2013), abstract; Doherty et al., Phys. Rep. 528, 1 (2013)).
    expect(markers.data.values).toEqual([
      { position: 575, label: "NV⁰ ZPL" },
      { position: 637, label: "NV⁻ ZPL" },
    ]);
    expect(markers.layer.map((l: Json) => l.mark.type)).toEqual(["rule", "text"]);
  });

  it("PL map: rect heatmap, colour bar in counts/s, scale bar in data coordinates", () => {
    const spec = build("pl-map", { scaleBarUm: 5, pixelUm: 0.1 });
    expect(spec.layer[0].mark.type).toBe("rect");
    expect(spec.layer[0].encoding.color.legend.title).toBe("count rate (kcounts/s)");
    const bar = spec.layer[1];
    expect(bar.layer.map((l: Json) => l.mark.type)).toEqual(["rule", "text"]);
    expect(bar.layer[1].encoding.text).toEqual({ value: "5 µm" });
    expect(bar.transform.find((t: Json) => t.as === "bar_x1").calculate).toBe("datum.bar_x0 + 5");
  });

  it("strip plot: mean ± sd or median and IQR, and n per group", () => {
    const mean = build("group-strip");
    expect(mean.layer[1].mark.extent).toBe("stdev");
    expect(mean.layer[2].encoding.y.aggregate).toBe("mean");
    expect(mean.layer[3].transform[1].calculate).toBe("'n = ' + datum.strip_n");
    const median = build("group-strip", { summary: "median-iqr" });
    expect(median.layer[1].mark.extent).toBe("iqr");
    expect(median.layer[2].encoding.y.aggregate).toBe("median");
  });

  it("NV-NMR: the expected line of the nucleus at the field, in MHz or as the dip's τ", () => {
    // ¹H: γ/2π = 42.577 MHz/T, so 50 mT → 2.12887 MHz and τ = 1/(2f) = 0.234867 µs.
    expect(expectedNucleusMarker("1H", 50, "frequency").position).toBeCloseTo(2.12887, 4);
    expect(expectedNucleusMarker("1H", 50, "spacing").position).toBeCloseTo(0.234867, 5);
    expect(expectedNucleusMarker("13C", 100, "frequency").position).toBeCloseTo(1.07084, 4);
    const spec = build("nv-nmr", { nucleus: "1H", fieldMt: 50 });
    expect(spec.layer[spec.layer.length - 1].data.values).toEqual([{ position: 2.12887, label: "¹H at 50 mT" }]);
    expect(collect(spec, "title")).toContain("frequency (MHz)");
    expect(collect(build("nv-nmr", { xQuantity: "spacing" }), "title")).toContain("τ (µs)");
  });

  it("scatter/line: error bars and series colours when asked for", () => {
    const spec = build("scatter-line", { sigmaField: "s", colorField: "series", marks: "line+points" });
    expect(spec.layer.map((l: Json) => l.mark.type)).toEqual(["errorbar", "line", "point"]);
    expect(spec.layer[2].encoding.color).toMatchObject({ field: "series", type: "nominal" });
  });

  it("escape column names that Vega-Lite would read as nested fields", () => {
    const spec = build("scatter-line", { xField: "B.field (mT)", yField: "count[0]" });
    expect(spec.layer[0].encoding.x.field).toBe("B\\.field (mT)");
    expect(spec.layer[0].encoding.y.field).toBe("count\\[0\\]");
  });
});

describe("T₂ versus pulse number", () => {
  // The fitted line is T₂(1)·N^s with the values typed from the scaling fit; on log–log axes it is straight.
  const spec = build("pulse-scaling", { fitT2One: 120.609, fitExponent: 0.6645 });

  it("draws points with ± σ error bars and the fitted power law, both axes logarithmic", () => {
    expect(spec.data).toEqual({ name: "scaling" });
    expect(spec.layer.map((l: Json) => l.mark.type)).toEqual(["errorbar", "point", "line"]);
    for (const l of spec.layer) {
      expect(l.encoding.x.scale.type).toBe("log");
      expect(l.encoding.y.scale.type).toBe("log");
    }
    expect(spec.layer[0].encoding.yError).toEqual({ field: "T2_err" });
    expect(spec.layer[2].transform).toEqual([{ calculate: '120.609 * pow(datum["N"], 0.6645)', as: "pulse_scaling_fit" }]);
    expect(spec.layer[2].encoding.y.field).toBe("pulse_scaling_fit");
    expect(spec.layer[0].encoding.x.title).toBe("number of π pulses N");
    expect(spec.layer[0].encoding.y.title).toBe("T₂ (µs)");
  });

  it("leaves the line out until a fitted T₂(1) is given, and the error bars when no σ column is named", () => {
    expect(build("pulse-scaling", {}).layer.map((l: Json) => l.mark.type)).toEqual(["errorbar", "point"]);
    expect(build("pulse-scaling", { sigmaField: "" }).layer.map((l: Json) => l.mark.type)).toEqual(["point"]);
  });

  it("passes the spec's security check and reads only the bound columns", async () => {
    const { checkSpecSecurity } = await import("@/lib/figures/spec-security");
    // The pow() of the fitted line is on the expression allow-list; nothing else is written in the spec.
    expect(checkSpecSecurity(spec)).toMatchObject({ issues: [], dataNames: ["scaling"], inlineValues: 0 });
    const { specFields } = await import("@/lib/figures/spec-fields");
    expect(specFields(spec).scaling!.sort()).toEqual(["N", "T2", "T2_err"]);
  });
});
