import { beforeAll, describe, expect, it } from "vitest";
import { DEMO_MANUSCRIPT_ID } from "@/lib/demo-data/accounts";
import * as upload from "@/app/api/manuscripts/[id]/datasets/route";
import * as figuresRoute from "@/app/api/figures/route";
import * as panelsRoute from "@/app/api/figures/[id]/panels/route";
import * as panel from "@/app/api/panels/[id]/route";
import * as revisions from "@/app/api/panels/[id]/revisions/route";
import { dataDefaults } from "@/lib/figures/plots/data-defaults";
import { handEditsOf, readTemplateRecord, withTemplateRecord } from "@/lib/figures/template-record";
import { getTemplate, type FigureTemplate } from "@/lib/figures/templates";
import { call, setupTestApp, uploadForm, type Who } from "./harness";

let tokens: Record<Who, string>;
let versionId: string;
const spectrum = getTemplate("spectrum")! as FigureTemplate<any>;

beforeAll(async () => {
  ({ tokens } = await setupTestApp());
  const csv = "f (MHz),PL (counts)\n2860,1000\n2870,950\n2880,1001\n";
  const meta = JSON.stringify({ kind: "odmr", sample: "K17" });
  const form = uploadForm("odmr.csv", csv, { name: "ODMR sweep", metadata: meta });
  versionId = (await call(upload.POST, { method: "POST", token: tokens.author, params: { id: DEMO_MANUSCRIPT_ID }, rawBody: form })).json.id;
});

async function newPanel(): Promise<string> {
  const f = await call(figuresRoute.POST, {
    method: "POST",
    token: tokens.author,
    body: { manuscriptId: DEMO_MANUSCRIPT_ID, title: "Resonances", widthMm: 89 },
  });
  return (await call(panelsRoute.POST, { method: "POST", token: tokens.author, params: { id: f.json.id }, body: { title: "ODMR" } })).json.id;
}

describe("builder round trip through the API", () => {
  it("a revision saved with template options loads with the same template and options; a hand edit is listed by path", async () => {
    const panelId = await newPanel();
    // The builder's defaults for this upload (kind odmr, columns f (MHz) and PL (counts), no stored fit).
    const auto = dataDefaults(spectrum, {
      kind: "odmr",
      columns: [
        { name: "f", unit: "MHz", type: "number" },
        { name: "PL", unit: "counts", type: "number" },
      ],
    });
    expect(auto).toMatchObject({ xField: "f", yField: "PL", xName: "Microwave frequency", xUnit: "MHz", markers: [] });
    const options = { ...auto, dataName: "odmr", fitName: "", yScale: "linear", print: { widthMm: 89, heightMm: 55, labelPt: 7, titlePt: 8 } };
    const first = await call(revisions.POST, {
      method: "POST",
      token: tokens.author,
      params: { id: panelId },
      body: {
        spec: withTemplateRecord(spectrum.build(options), { id: "spectrum", options }),
        bindings: { odmr: { versionId } },
        baseRevisionId: null,
        message: "from the builder",
      },
    });
    expect(first.status).toBe(201);

    const opened = (await call(panel.GET, { token: tokens.author, params: { id: panelId } })).json;
    expect(readTemplateRecord(opened.currentRevision.spec)).toEqual({ id: "spectrum", options });
    expect(opened.currentRevision.bindings).toEqual({ odmr: { versionId } });
    expect(handEditsOf(spectrum, options, opened.currentRevision.spec)).toEqual([]);

    // A co-author edits the x title in the spec editor and saves: the record travels in the spec text.
    const edited = structuredClone(opened.currentRevision.spec);
    edited.layer[0].encoding.x.title = "f (MHz)";
    const second = await call(revisions.POST, {
      method: "POST",
      token: tokens.author,
      params: { id: panelId },
      body: { spec: edited, bindings: { odmr: { versionId } }, baseRevisionId: first.json.id, message: "shorter x title" },
    });
    expect(second.status).toBe(201);
    const reopened = (await call(panel.GET, { token: tokens.author, params: { id: panelId } })).json;
    expect(readTemplateRecord(reopened.currentRevision.spec)).toEqual({ id: "spectrum", options });
    expect(handEditsOf(spectrum, options, reopened.currentRevision.spec).map((e) => [e.where, e.before, e.after])).toEqual([
      ["layer[0].encoding.x.title", "Microwave frequency (MHz)", "f (MHz)"],
    ]);
  });
});
