import { describe, expect, it } from "vitest";
import { canonicalJson } from "@/lib/figures/canonical-spec";
import { describeSpecChange } from "@/lib/figures/describe-spec-change";
import { fieldsOverridden, handEditsOf, readTemplateRecord, rebaseHandEdits, withoutTemplateRecord, withTemplateRecord } from "@/lib/figures/template-record";
import { getTemplate, PRINT_OPTION_FIELDS, type FigureTemplate } from "@/lib/figures/templates";
import { validateSpec } from "@/lib/figures/validate-spec";

type Json = Record<string, any>;
const spectrum = getTemplate("spectrum")! as FigureTemplate<any>;
const decay = getTemplate("decay-curve")! as FigureTemplate<any>;

/** What the builder saves for an ODMR panel: the spec its options build, with the record beside it in usermeta. */
const odmrOptions = {
  dataName: "odmr",
  xField: "f",
  yField: "PL",
  fitName: "fit",
  xName: "Microwave frequency",
  xUnit: "MHz",
  yName: "PL",
  yUnit: "counts",
  yScale: "linear",
  markers: [
    { position: 2730.12, label: "f₋" },
    { position: 3009.88, label: "f₊" },
  ],
  print: { widthMm: 89, heightMm: 55, labelPt: 7, titlePt: 8 },
};
const saveFromBuilder = (options: Record<string, unknown>) => withTemplateRecord(spectrum.build(options), { id: "spectrum", options });
/** As the server stores and returns a revision's spec: canonical JSON, parsed again. */
const roundTrip = (spec: unknown) => JSON.parse(canonicalJson(spec)) as Json;

describe("the builder's record in a revision", () => {
  it("save with template options → load → the same template and options", () => {
    const stored = roundTrip(saveFromBuilder(odmrOptions));
    expect(readTemplateRecord(stored)).toEqual({ id: "spectrum", options: odmrOptions });
    expect(handEditsOf(spectrum, odmrOptions, stored)).toEqual([]);
  });

  it("passes the spec checks the server applies (usermeta.template is allowed, nested to the markers)", () => {
    const r = validateSpec(saveFromBuilder(odmrOptions));
    expect(r).toMatchObject({ ok: true, dataNames: ["fit", "odmr"] });
    // Still no display options hidden in it.
    const hostile = saveFromBuilder(odmrOptions) as Json;
    hostile.usermeta.template.options.embedOptions = { actions: true };
    expect(validateSpec(hostile)).toMatchObject({ ok: false });
  });

  it("is not the spec: without it the spec is exactly what the template builds; no record reads as null", () => {
    expect(withoutTemplateRecord(saveFromBuilder(odmrOptions))).toEqual(spectrum.build(odmrOptions));
    expect(readTemplateRecord(spectrum.build(odmrOptions))).toBeNull();
    expect(readTemplateRecord({ usermeta: { note: "by hand" } })).toBeNull();
    expect(withoutTemplateRecord(withTemplateRecord({ mark: "point", usermeta: { note: "kept" } }, { id: "x", options: {} }))).toEqual({
      mark: "point",
      usermeta: { note: "kept" },
    });
  });

  it("a hand edit in the spec editor is listed by its path, and the builder field it overrides is named", () => {
    const stored = roundTrip(saveFromBuilder(odmrOptions));
    stored.layer[0].encoding.x.title = "f (MHz)";
    stored.layer[0].mark.strokeWidth = 1.2;
    const edits = handEditsOf(spectrum, odmrOptions, stored);
    expect(edits.map((e) => [e.kind, e.where, e.after])).toEqual([
      ["changed", "layer[0].mark.strokeWidth", 1.2],
      ["changed", "layer[0].encoding.x.title", "f (MHz)"],
    ]);
    // xName also titles the fitted curve's and the markers' x channels, so it is still in part the builder's.
    expect(fieldsOverridden(spectrum, odmrOptions, [...spectrum.options, ...PRINT_OPTION_FIELDS], edits)).toEqual([]);
    const all = roundTrip(stored);
    for (const path of [all.layer[1].encoding.x, all.layer[2].layer[0].encoding.x, all.layer[2].layer[1].encoding.x]) path.title = "f (MHz)";
    const allEdits = handEditsOf(spectrum, odmrOptions, all);
    // Every x title edited: the x name and unit fields change nothing drawn any more.
    expect(fieldsOverridden(spectrum, odmrOptions, [...spectrum.options, ...PRINT_OPTION_FIELDS], allEdits)).toEqual(["xName", "xUnit"]);
  });

  it("keeps hand edits when a builder field changes afterwards, and the new value shows where it is still the builder's", () => {
    const stored = roundTrip(saveFromBuilder(odmrOptions));
    stored.layer[0].mark.strokeWidth = 1.2;
    stored.layer[0].encoding.y.scale = { domain: [0.9, 1.01] };
    const edits = handEditsOf(spectrum, odmrOptions, stored);
    const next = { ...odmrOptions, yName: "Normalised PL", yUnit: "" };
    const { spec, lost } = rebaseHandEdits(spectrum.build(odmrOptions), stored, spectrum.build(next), edits);
    expect(lost).toEqual([]);
    const s = spec as Json;
    expect(s.layer[0].mark.strokeWidth).toBe(1.2);
    expect(s.layer[0].encoding.y.scale).toEqual({ domain: [0.9, 1.01] });
    expect(s.layer[0].encoding.y.title).toBe("Normalised PL");
    // Saved again from the builder, the edits are still listed (they stay hand edits of the new options).
    const again = roundTrip(withTemplateRecord(s, { id: "spectrum", options: next }));
    expect(handEditsOf(spectrum, next, again).map((e) => e.where)).toEqual([
      "layer[0].mark.strokeWidth",
      "layer[0].encoding.y.scale.domain",
      "layer[0].encoding.y.scale.zero",
    ]);
  });

  it("an edit whose place is gone is reported lost, not written somewhere else", () => {
    const options = { ...odmrOptions };
    const stored = roundTrip(saveFromBuilder(options));
    stored.layer[1].mark.color = "#009E73"; // the fitted curve
    const edits = handEditsOf(spectrum, options, stored);
    const noFit = { ...options, fitName: "" };
    const { spec, lost } = rebaseHandEdits(spectrum.build(options), stored, spectrum.build(noFit), edits);
    expect(lost.map((e) => e.where)).toEqual(["layer[1].mark.color"]);
    // layer[1] is now the marker group; it did not get the fit's colour.
    expect((spec as Json).layer[1].mark).toBeUndefined();
  });

  it("a decay curve's added layer survives a change of time scale", () => {
    const options = { dataName: "echo", xField: "tau", yField: "signal", fitName: "", residualName: "", xScale: "linear" };
    const stored = roundTrip(withTemplateRecord(decay.build(options), { id: "decay-curve", options }));
    stored.layer.push({ mark: { type: "rule" }, encoding: { y: { datum: 0.5 } } });
    const edits = handEditsOf(decay, options, stored);
    expect(edits.map((e) => [e.kind, e.where])).toEqual([["added", "layer[1]"]]);
    const { spec, lost } = rebaseHandEdits(decay.build(options), stored, decay.build({ ...options, xScale: "log" }), edits);
    expect(lost).toEqual([]);
    expect((spec as Json).layer.map((l: Json) => l.mark.type)).toEqual(["point", "rule"]);
    expect((spec as Json).layer[0].encoding.x.scale.type).toBe("log");
  });

  it("revision changes in words leave the record out: a y name change reads as the title and description it changed", () => {
    const before = saveFromBuilder(odmrOptions);
    const after = saveFromBuilder({ ...odmrOptions, yName: "Normalised PL", yUnit: "" });
    expect(describeSpecChange({ spec: before }, { spec: after }).map((c) => c.text)).toEqual([
      'description: "Spectrum of PL against Microwave frequency" → "Spectrum of Normalised PL against Microwave frequency"',
      'axis title of y in layers 1 and 2: "PL (counts)" → "Normalised PL"',
    ]);
  });
});
