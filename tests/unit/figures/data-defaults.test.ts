import { describe, expect, it } from "vitest";
import { dataDefaults, NV_ZPL_MARKERS, odmrMarkers, templateForKind } from "@/lib/figures/plots/data-defaults";
import { getTemplate, type FigureTemplate } from "@/lib/figures/templates";

type Json = Record<string, any>;
const template = (id: string) => getTemplate(id)! as FigureTemplate<any>;
const col = (name: string, unit: string | null, type = "number") => ({ name, unit, type });

/** The stored fit of the demo ODMR sweep, as the analyses API lists it (values hand-written). */
const twoResonanceFit = {
  model: "odmr_two_resonances",
  parameters: [
    { name: "B", value: 1.0, unit: "a.u." },
    { name: "fMinus", value: 2730.12, unit: "MHz" },
    { name: "wMinus", value: 6.1, unit: "MHz" },
    { name: "cMinus", value: 0.05, unit: "1" },
    { name: "fPlus", value: 3009.88, unit: "MHz" },
    { name: "wPlus", value: 6.0, unit: "MHz" },
    { name: "cPlus", value: 0.05, unit: "1" },
  ],
};

describe("templates that follow the data", () => {
  it("suggest a template by kind of measurement", () => {
    expect(templateForKind("odmr")).toBe("spectrum");
    expect(templateForKind("pl_spectrum")).toBe("spectrum");
    expect(templateForKind("hahn_echo")).toBe("decay-curve");
    expect(templateForKind("relaxation")).toBe("decay-curve");
    expect(templateForKind("nv_nmr")).toBe("nv-nmr");
    expect(templateForKind("pl_map")).toBe("pl-map");
    expect(templateForKind("other")).toBe("scatter-line");
  });

  it("an ODMR sweep with columns f (MHz), PL (counts) gets x = f titled 'Microwave frequency (MHz)', y = PL, and f₋/f₊ from its fit", () => {
    const facts = { kind: "odmr", columns: [col("f", "MHz"), col("PL", "counts")], fit: twoResonanceFit };
    const d = dataDefaults(template("spectrum"), facts);
    expect(d).toEqual({
      xField: "f",
      yField: "PL",
      xName: "Microwave frequency",
      xUnit: "MHz",
      yName: "PL",
      yUnit: "counts",
      markers: [
        { position: 2730.12, label: "f₋" },
        { position: 3009.88, label: "f₊" },
      ],
    });
    const spec = template("spectrum").build(d) as unknown as Json;
    expect(spec.layer[0].encoding.x).toMatchObject({ field: "f", title: "Microwave frequency (MHz)" });
    expect(spec.layer[0].encoding.y).toMatchObject({ field: "PL", title: "PL (counts)" });
    // No wavelength axis and no zero-phonon line on a microwave sweep.
    expect(JSON.stringify(spec)).not.toMatch(/ZPL|wavelength|nm\)/);
  });

  it("an ODMR sweep with no stored fit gets no marker lines at all", () => {
    const d = dataDefaults(template("spectrum"), { kind: "odmr", columns: [col("frequency", "MHz"), col("pl", "a.u.")], fit: null });
    expect(d.markers).toEqual([]);
    expect(d.xField).toBe("frequency");
    expect(d.yField).toBe("pl");
  });

  it("writes fit resonances in the axis unit: 2.87 GHz on a MHz axis is 2870 MHz", () => {
    const fit = { model: "odmr_lorentzian_1", parameters: [{ name: "f1", value: 2.87, unit: "GHz" }] };
    expect(odmrMarkers(fit, "MHz")).toEqual([{ position: 2870, label: "f₁" }]);
    const two = {
      model: "odmr_lorentzian_2",
      parameters: [
        { name: "f1", value: 2900, unit: "MHz" },
        { name: "f2", value: 2840, unit: "MHz" },
      ],
    };
    expect(odmrMarkers(two, "MHz")).toEqual([
      { position: 2840, label: "f₋" },
      { position: 2900, label: "f₊" },
    ]);
    expect(odmrMarkers({ model: "odmr_14n_triplet", parameters: [{ name: "f0", value: 2870.5, unit: "MHz" }] }, "MHz")).toEqual([
      { position: 2870.5, label: "f₀" },
    ]);
  });

  it("a PL spectrum with wavelength (nm), counts gets a wavelength axis and the NV⁰ 575 nm / NV⁻ 637 nm zero-phonon lines", () => {
    // Manson et al., Phys. Rev. B 87, 155209 (2013), abstract: NV⁻ "637 nm (1.945 eV)", NV⁰ "575 nm (2.156 eV)";
    // Doherty et al., Phys. Rep. 528, 1 (2013).
    expect(NV_ZPL_MARKERS).toEqual([
      { position: 575, label: "NV⁰ ZPL" },
      { position: 637, label: "NV⁻ ZPL" },
    ]);
    const d = dataDefaults(template("spectrum"), { kind: "pl_spectrum", columns: [col("wavelength", "nm"), col("counts", null)] });
    expect(d).toEqual({
      xField: "wavelength",
      yField: "counts",
      xName: "Wavelength",
      xUnit: "nm",
      yName: "PL intensity",
      yUnit: "",
      markers: NV_ZPL_MARKERS,
    });
    // The same lines on a µm axis.
    const um = dataDefaults(template("spectrum"), { kind: "pl_spectrum", columns: [col("lambda", "µm"), col("I", "cps")] });
    expect(um.markers).toEqual([
      { position: 0.575, label: "NV⁰ ZPL" },
      { position: 0.637, label: "NV⁻ ZPL" },
    ]);
  });

  it("a Hahn echo tau (µs), signal, sigma gets a log time axis, σ error bars and y ≠ x", () => {
    const d = dataDefaults(template("decay-curve"), { kind: "hahn_echo", columns: [col("tau", "µs"), col("signal", "norm"), col("sigma", "norm")] });
    expect(d).toEqual({
      xField: "tau",
      yField: "signal",
      sigmaField: "sigma",
      xName: "Free evolution time τ",
      xUnit: "µs",
      yName: "Echo signal",
      yUnit: "norm",
      xScale: "log",
    });
    expect(dataDefaults(template("decay-curve"), { kind: "relaxation", columns: [col("wait", "ms"), col("pl", "norm")] })).toMatchObject({
      xField: "wait",
      yField: "pl",
      xName: "Dark time τ",
      xUnit: "ms",
      xScale: "log",
    });
    // Ramsey fringes stay on a linear axis.
    expect(dataDefaults(template("decay-curve"), { kind: "ramsey", columns: [col("t", "ns"), col("pl", "norm")] }).xScale).toBeUndefined();
  });

  it("never puts the same column on x and y, whatever the order of the columns", () => {
    for (const kind of ["odmr", "pl_spectrum", "hahn_echo", "other"]) {
      const d = dataDefaults(template("scatter-line"), { kind, columns: [col("PL", "counts"), col("f", "MHz")] });
      expect(d.xField).not.toBe(d.yField);
    }
    const odmr = dataDefaults(template("spectrum"), { kind: "odmr", columns: [col("PL", "counts"), col("f", "MHz")] });
    expect([odmr.xField, odmr.yField]).toEqual(["f", "PL"]);
    // One number column: x only, y left to the person (the builder asks).
    expect(dataDefaults(template("scatter-line"), { kind: "other", columns: [col("f", "MHz"), col("note", null, "string")] }).yField).toBeUndefined();
  });

  it("NV-NMR on a τ column switches the axis to pulse spacing; a PL map takes its position unit and value column", () => {
    expect(dataDefaults(template("nv-nmr"), { kind: "nv_nmr", columns: [col("tau", "µs"), col("contrast", "norm")] })).toMatchObject({
      xField: "tau",
      yField: "contrast",
      xQuantity: "spacing",
      xName: "Pulse spacing τ",
      yName: "Contrast",
    });
    expect(dataDefaults(template("pl-map"), { kind: "pl_map", columns: [col("x", "µm"), col("y", "µm"), col("rate", "kcps")] })).toEqual({
      xField: "x",
      yField: "y",
      valueField: "rate",
      xName: "x",
      yName: "y",
      unit: "µm",
      colorTitle: "PL (kcps)",
    });
  });

  it("every axis label of every template is a text option the builder can edit", () => {
    const labels: Record<string, string[]> = {
      "decay-curve": ["xName", "xUnit", "yName", "yUnit", "residualTitle"],
      spectrum: ["xName", "xUnit", "yName", "yUnit"],
      "pl-map": ["xName", "yName", "unit", "colorTitle"],
      "group-strip": ["groupName", "valueName", "unit"],
      "nv-nmr": ["xName", "yName", "yUnit"],
      "scatter-line": ["xName", "xUnit", "yName", "yUnit"],
    };
    for (const [id, keys] of Object.entries(labels)) {
      const texts = template(id)
        .options.filter((o) => o.kind === "text")
        .map((o) => o.key);
      expect(texts, id).toEqual(expect.arrayContaining(keys));
    }
    const residual = template("decay-curve").build({ residualTitle: "fit − data" }) as unknown as Json;
    expect(residual.vconcat[1].layer[1].encoding.y.title).toBe("fit − data");
    const nmr = template("nv-nmr").build({ xName: "RF frequency" }) as unknown as Json;
    expect(nmr.layer[0].encoding.x.title).toBe("RF frequency (MHz)");
    const map = template("pl-map").build({ xName: "X position", yName: "Y position" }) as unknown as Json;
    expect(map.layer[0].encoding.x.title).toBe("X position (µm)");
    expect(map.layer[0].encoding.y.title).toBe("Y position (µm)");
  });
});
