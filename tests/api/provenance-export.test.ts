// The figure's provenance as W3C PROV-JSON (GET /api/figures/{id}/trace?format=prov) and the reproducibility
// bundle as an RO-Crate 1.2. Expected values come from outside the code under test: the W3C schema file, hashes
// recomputed here with node:crypto, the demo accounts' names, the hahn_echo model's version written out by hand.
import { createHash } from "node:crypto";
import fs from "node:fs";
import path from "node:path";
import Ajv from "ajv";
import { strFromU8, unzipSync } from "fflate";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { DEMO_MANUSCRIPT_ID } from "@/lib/demo-data/accounts";
import { hahnEchoFiles } from "@/lib/demo-data/hahn-echo";
import { stopRenderWorkers } from "@/lib/server/render/render-in-worker";
import * as upload from "@/app/api/manuscripts/[id]/datasets/route";
import * as analyses from "@/app/api/analyses/route";
import * as figuresRoute from "@/app/api/figures/route";
import * as figureRoute from "@/app/api/figures/[id]/route";
import * as panelsRoute from "@/app/api/figures/[id]/panels/route";
import * as revisions from "@/app/api/panels/[id]/revisions/route";
import * as sendToReview from "@/app/api/panels/[id]/send-to-review/route";
import * as approvals from "@/app/api/panels/[id]/approvals/route";
import * as signoff from "@/app/api/figures/[id]/signoff/route";
import * as withdraw from "@/app/api/figures/[id]/signoff/withdraw/route";
import * as traceRoute from "@/app/api/figures/[id]/trace/route";
import { call, setupTestApp, uploadForm, type Who } from "./harness";

let tokens: Record<Who, string>;
let figureId: string;
let versionId: string;
let analysisId: string;
const VL = "https://vega.github.io/schema/vega-lite/v6.json";
const sha256 = (b: Uint8Array | string) => createHash("sha256").update(b).digest("hex");
const post = (h: any, who: Who, params: Record<string, string>, body?: unknown) => call(h, { method: "POST", token: tokens[who], params, body });

async function exportFile(query: string, who: Who = "viewer") {
  const { GET } = await import("@/app/api/figures/[id]/export/route");
  const res = await GET(new Request(`http://localhost/x?${query}`, { headers: { authorization: `Bearer ${tokens[who]}` } }), {
    params: Promise.resolve({ id: figureId }),
  });
  expect(res.status).toBe(200);
  return new Uint8Array(await res.arrayBuffer());
}

// The PROV-JSON schema published with the W3C Member Submission (https://www.w3.org/submissions/prov-json/schema),
// kept unchanged in tests/fixtures. It is draft-04, whose `id` later drafts call `$id`; ajv 8 reads only `$id`.
// Its two formats are given here: "uri" as RFC 3986 §3 (a scheme, a colon, then no spaces or controls) and
// "date-time" as RFC 3339 §5.6.
function provSchemaValidator() {
  const { id, $schema: _draft04, ...schema } = JSON.parse(fs.readFileSync(path.join(__dirname, "../fixtures/prov-json.schema.json"), "utf8"));
  expect(id).toBe("http://provenance.ecs.soton.ac.uk/prov-json/schema#");
  const ajv = new Ajv({
    strict: false,
    validateSchema: false,
    allErrors: true,
    formats: {
      uri: /^[A-Za-z][A-Za-z0-9+.-]*:[^\s\p{Cc}"<>\\^`{|}]*$/u,
      "date-time": /^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}:\d{2}(\.\d+)?(Z|[+-]\d{2}:\d{2})$/i,
    },
  });
  return ajv.compile({ ...schema, $id: id });
}

beforeAll(async () => {
  ({ tokens } = await setupTestApp());
  const echo = hahnEchoFiles()[0]!;
  versionId = (
    await call(upload.POST, { method: "POST", token: tokens.author, params: { id: DEMO_MANUSCRIPT_ID }, rawBody: uploadForm(echo.fileName, echo.content) })
  ).json.id;
  analysisId = (await post(analyses.POST, "author", {}, { versionId, model: "hahn_echo", options: { x: "tau", y: "signal", sigma: "sigma" } })).json.id;
  figureId = (await post(figuresRoute.POST, "author", {}, { manuscriptId: DEMO_MANUSCRIPT_ID, title: "Coherence", widthMm: 183, columns: 2 })).json.id;
  const enc = {
    x: { field: "tau", type: "quantitative", title: "τ (µs)", scale: { type: "log" } },
    y: { field: "signal", type: "quantitative", title: "signal (norm.)" },
  };
  const panels: string[] = [];
  for (const spec of [
    {
      bindings: { echo: { versionId }, fit: { analysisId, output: "curve" } },
      spec: {
        $schema: VL,
        width: 200,
        height: 140,
        layer: [
          { data: { name: "echo" }, mark: "point", encoding: enc },
          { data: { name: "fit" }, mark: "line", encoding: enc },
        ],
      },
    },
    {
      bindings: { res: { analysisId, output: "residuals" } },
      spec: { $schema: VL, width: 200, height: 140, data: { name: "res" }, mark: "point", encoding: enc },
    },
  ]) {
    const panelId = (await post(panelsRoute.POST, "author", { id: figureId }, {})).json.id;
    const rev = await post(revisions.POST, "author", { id: panelId }, { baseRevisionId: null, ...spec });
    expect(rev.status).toBe(201);
    await post(sendToReview.POST, "author", { id: panelId });
    expect((await post(approvals.POST, "reviewer", { id: panelId }, { revisionId: rev.json.id, decision: "approved", note: "Fine." })).status).toBe(201);
    panels.push(panelId);
  }
  const figureHash = (await call(figureRoute.GET, { token: tokens.pi, params: { id: figureId } })).json.figureHash;
  const first = await post(signoff.POST, "pi", { id: figureId }, { figureHash });
  expect(first.status).toBe(201);
  expect((await post(withdraw.POST, "pi", { id: figureId }, { signoffId: first.json.id, reason: "Axis labels first." })).status).toBe(200);
  expect((await post(signoff.POST, "pi", { id: figureId }, { figureHash, reason: "Labels fixed." })).status).toBe(201);
  await exportFile("format=pdf", "author"); // one export on record before the trace is read
}, 180_000);
afterAll(async () => {
  await stopRenderWorkers();
});

describe("the trace as W3C PROV-JSON", () => {
  it("validates against the PROV-JSON schema of the W3C submission", async () => {
    const r = await call(traceRoute.GET, { token: tokens.viewer, params: { id: figureId }, path: "/x?format=prov" });
    expect(r.status).toBe(200);
    const validate = provSchemaValidator();
    expect(validate(r.json), JSON.stringify(validate.errors)).toBe(true);
    // The schema checks shape, not meaning: the same validator refuses a relation without its required entity …
    expect(validate({ ...r.json, wasGeneratedBy: { "_:x": { "prov:activity": "pl:a" } } })).toBe(false);
    // … and a top-level key PROV-JSON does not define.
    expect(validate({ ...r.json, relations: {} })).toBe(false);
  });

  it("names every entity, activity and agent of the JSON trace, and every relation joins declared elements", async () => {
    const trace = (await call(traceRoute.GET, { token: tokens.viewer, params: { id: figureId } })).json;
    const prov = (await call(traceRoute.GET, { token: tokens.viewer, params: { id: figureId }, path: "/x?format=prov" })).json;
    expect(prov.prefix).toEqual({ pl: "urn:prooflight:", nih: "nih:sha-256;" });

    const entities = new Set<string>([`pl:figure/${trace.figure.figureHash}`]);
    const activities = new Set<string>();
    const agents = new Map<string, string>();
    for (const p of trace.panels) {
      entities.add(`pl:revision/${p.revision.id}`).add(`pl:spec/${p.revision.specSha256}`);
      activities.add(`pl:save/${p.revision.id}`);
      for (const input of p.inputs) {
        const versions = input.kind === "version" ? [input.version] : [input.input, input.derived];
        for (const v of versions) {
          entities.add(`pl:version/${v.versionId}`).add(`nih:${v.sha256}`);
          activities.add(`pl:parse/${v.versionId}`);
        }
        if (input.kind === "analysis") {
          activities.add(`pl:fit/${input.analysis.id}`);
          agents.set(`pl:person/${input.analysis.createdBy.id}`, input.analysis.createdBy.name);
        }
      }
    }
    for (const d of trace.decisions) activities.add(`pl:decision/${d.id}`);
    for (const s of trace.signoffs) activities.add(`pl:signoff/${s.id}`);
    for (const e of trace.exports) entities.add(`pl:export/${e.seq}`);
    activities.add(`pl:upload/${versionId}`).add(`pl:fit/${analysisId}`);

    // What this test set up, counted by hand: two panels, one upload, one fit, two approvals, two sign-offs (one withdrawn), one PDF export.
    expect(trace.panels).toHaveLength(2);
    expect(trace.decisions.map((d: any) => [d.panelLetter, d.decision, d.by.name])).toEqual([
      ["a", "approved", "Ines Varga"],
      ["b", "approved", "Ines Varga"],
    ]);
    expect(trace.signoffs.map((s: any) => [s.by.name, s.withdrawn?.reason ?? null])).toEqual([
      ["Mira Halvorsen", "Axis labels first."],
      ["Mira Halvorsen", null],
    ]);
    expect(trace.exports.map((e: any) => [e.format, e.by.name])).toEqual([["pdf", "Tomás Ekberg"]]);
    agents.set("pl:person/demo-author", "Tomás Ekberg").set("pl:person/demo-reviewer", "Ines Varga").set("pl:person/demo-pi", "Mira Halvorsen");

    for (const e of entities) expect(prov.entity, e).toHaveProperty([e]);
    for (const a of activities) expect(prov.activity, a).toHaveProperty([a]);
    for (const [id, name] of agents) expect(prov.agent[id]).toEqual({ "prov:type": { $: "prov:Person", type: "prov:QUALIFIED_NAME" }, "prov:label": name });
    expect(prov.agent["pl:software/model/hahn_echo/1.0.0"]["prov:type"]).toEqual({ $: "prov:SoftwareAgent", type: "prov:QUALIFIED_NAME" });
    expect(prov.activity[`pl:withdrawal/${trace.signoffs[0].id}`]["pl:reason"]).toBe("Axis labels first.");

    // Referential integrity: every relation names elements the document declares.
    const declared = (id: string, ...kinds: Array<"entity" | "activity" | "agent">) => kinds.some((k) => id in prov[k]);
    const ends: Record<string, Array<[string, Array<"entity" | "activity" | "agent">]>> = {
      used: [
        ["prov:activity", ["activity"]],
        ["prov:entity", ["entity"]],
      ],
      wasGeneratedBy: [
        ["prov:entity", ["entity"]],
        ["prov:activity", ["activity"]],
      ],
      wasAssociatedWith: [
        ["prov:activity", ["activity"]],
        ["prov:agent", ["agent"]],
      ],
      wasDerivedFrom: [
        ["prov:generatedEntity", ["entity"]],
        ["prov:usedEntity", ["entity"]],
      ],
      wasAttributedTo: [
        ["prov:entity", ["entity"]],
        ["prov:agent", ["agent"]],
      ],
      wasInformedBy: [
        ["prov:informed", ["activity"]],
        ["prov:informant", ["activity"]],
      ],
    };
    for (const [relation, fields] of Object.entries(ends))
      for (const rec of Object.values<Record<string, string>>(prov[relation] ?? {}))
        for (const [f, kinds] of fields) expect(declared(rec[f]!, ...kinds), `${relation} ${f} ${rec[f]}`).toBe(true);

    // The chain itself: the fit used the uploaded version, generated the derived file, and ran as the author with the model at 1.0.0.
    const has = (relation: string, rec: Record<string, string>) => Object.values(prov[relation]).some((r) => JSON.stringify(r) === JSON.stringify(rec));
    const fitInput = trace.panels[0].inputs.find((i: any) => i.kind === "analysis");
    expect(has("used", { "prov:activity": `pl:fit/${analysisId}`, "prov:entity": `pl:version/${versionId}` })).toBe(true);
    expect(has("wasGeneratedBy", { "prov:entity": `nih:${fitInput.derived.sha256}`, "prov:activity": `pl:fit/${analysisId}` })).toBe(true);
    expect(has("wasAssociatedWith", { "prov:activity": `pl:fit/${analysisId}`, "prov:agent": "pl:person/demo-author" })).toBe(true);
    expect(has("wasAssociatedWith", { "prov:activity": `pl:fit/${analysisId}`, "prov:agent": "pl:software/model/hahn_echo/1.0.0" })).toBe(true);
    expect(
      has("wasDerivedFrom", {
        "prov:generatedEntity": `pl:figure/${trace.figure.figureHash}`,
        "prov:usedEntity": `pl:revision/${trace.panels[1].revision.id}`,
      }),
    ).toBe(true);
  });

  it("an unknown format is refused with the field named; outsiders get 404", async () => {
    const bad = await call(traceRoute.GET, { token: tokens.viewer, params: { id: figureId }, path: "/x?format=provn" });
    expect(bad.status).toBe(400);
    expect(bad.json.error.message).toContain("format must be json or prov");
    expect((await call(traceRoute.GET, { token: tokens.outsider, params: { id: figureId }, path: "/x?format=prov" })).status).toBe(404);
  });
});

describe("the bundle as an RO-Crate 1.2", () => {
  let bytes: Uint8Array;
  let files: Record<string, Uint8Array>;
  let graph: any[];
  let crate: any;
  beforeAll(async () => {
    bytes = await exportFile("format=bundle");
    files = unzipSync(bytes);
    crate = JSON.parse(strFromU8(files["ro-crate-metadata.json"]!));
    graph = crate["@graph"];
  }, 120_000);

  it("has the JSON-LD shape of RO-Crate 1.2: context, graph, metadata descriptor, root dataset", () => {
    // RO-Crate 1.2, "Root Data Entity" (https://www.researchobject.org/ro-crate/specification/1.2/root-data-entity.html).
    expect(crate["@context"]).toBe("https://w3id.org/ro/crate/1.2/context");
    expect(Array.isArray(graph)).toBe(true);
    for (const e of graph) {
      expect(typeof e["@id"]).toBe("string");
      expect(e["@type"]).toBeTruthy();
    }
    const ids = graph.map((e) => e["@id"]);
    expect(new Set(ids).size).toBe(ids.length);
    const descriptor = graph.find((e) => e["@id"] === "ro-crate-metadata.json");
    expect(descriptor).toEqual({
      "@id": "ro-crate-metadata.json",
      "@type": "CreativeWork",
      conformsTo: { "@id": "https://w3id.org/ro/crate/1.2" },
      about: { "@id": "./" },
    });
    const root = graph.find((e) => e["@id"] === "./");
    expect(root["@type"]).toBe("Dataset");
    for (const k of ["name", "description", "license"]) expect(typeof root[k]).toBe("string");
    expect(root.datePublished).toMatch(/^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}:\d{2}\.\d{3}Z$/);
    // Every reference inside the graph points at an entity of the graph (or at an outside URL).
    const known = new Set(ids);
    const refs = (v: unknown): string[] =>
      Array.isArray(v)
        ? v.flatMap(refs)
        : v && typeof v === "object"
          ? Object.keys(v).length === 1 && "@id" in v
            ? [(v as any)["@id"]]
            : Object.values(v).flatMap(refs)
          : [];
    for (const e of graph)
      for (const r of refs(Object.fromEntries(Object.entries(e).filter(([k]) => k !== "@id")))) expect(known.has(r) || /^https?:\/\//.test(r), r).toBe(true);
  });

  it("lists every file with its size, media type and a sha256 that matches the bytes in the zip", () => {
    const root = graph.find((e) => e["@id"] === "./");
    const inZip = Object.keys(files).filter((f) => f !== "ro-crate-metadata.json");
    expect(root.hasPart.map((r: any) => r["@id"]).sort()).toEqual([...inZip].sort());
    const fileEntities = graph.filter((e) => e["@type"] === "File");
    expect(fileEntities.map((e) => e["@id"]).sort()).toEqual([...inZip].sort());
    for (const e of fileEntities) {
      const b = files[e["@id"]]!;
      expect(e.sha256, e["@id"]).toBe(sha256(b));
      expect(e.contentSize, e["@id"]).toBe(String(b.byteLength));
      expect(e.encodingFormat, e["@id"]).toMatch(/^[a-z]+\/[\w.+-]+$/);
    }
    for (const f of ["figure.svg", "figure.pdf", "figure.png", "trace.json", "prov.json", "specs/panel-a.vl.json", "specs/panel-b.vl.json"])
      expect(inZip, f).toContain(f);
    expect(inZip.filter((f) => f.startsWith("raw/"))).toHaveLength(1);
    expect(inZip.filter((f) => f.startsWith("derived/"))).toHaveLength(1);
    expect(inZip.filter((f) => f.startsWith("fits/")).sort()).toEqual([`fits/hahn_echo-${analysisId}.json`, `fits/hahn_echo-${analysisId}.txt`]);
    // The raw file is the upload byte for byte.
    const echo = hahnEchoFiles()[0]!;
    expect(sha256(files[inZip.find((f) => f.startsWith("raw/"))!]!)).toBe(sha256(echo.content));
    // The spec file is the revision's spec: its hash is the trace's specSha256.
    const trace = JSON.parse(strFromU8(files["trace.json"]!));
    expect(sha256(files["specs/panel-a.vl.json"]!)).toBe(trace.panels[0].revision.specSha256);
    expect(strFromU8(files[`fits/hahn_echo-${analysisId}.txt`]!)).toMatch(/^Model: hahn_echo, version 1\.0\.0$/m);
    // The readable report judges the fit, not only whether the solver converged.
    expect(strFromU8(files[`fits/hahn_echo-${analysisId}.txt`]!)).toMatch(/^Quality: (good|questionable|not supported) — .+$/m);
    expect(strFromU8(files["figure.png"]!.slice(1, 4))).toBe("PNG");
    expect(strFromU8(files["figure.pdf"]!.slice(0, 5))).toBe("%PDF-");
  });

  it("describes each fit and the drawing as CreateActions, decisions and sign-offs as actions, people by name only", () => {
    const byId = new Map(graph.map((e) => [e["@id"], e]));
    const fit = byId.get(`#fit-${analysisId}`);
    expect(fit["@type"]).toBe("CreateAction");
    const instruments = fit.instrument.map((r: any) => byId.get(r["@id"]));
    expect(instruments.map((i: any) => [i["@type"], i.name, i.version])).toEqual([
      ["SoftwareApplication", "hahn_echo fit model", "1.0.0"],
      ["SoftwareApplication", "Prooflight", "0.1.0"],
    ]);
    expect(fit.object.map((r: any) => r["@id"])).toEqual([expect.stringMatching(/^raw\//)]);
    expect(fit.result.map((r: any) => r["@id"])).toEqual([
      expect.stringMatching(/^derived\//),
      `fits/hahn_echo-${analysisId}.json`,
      `fits/hahn_echo-${analysisId}.txt`,
    ]);
    expect(byId.get(fit.agent["@id"])).toEqual({ "@id": "#person-demo-author", "@type": "Person", name: "Tomás Ekberg" });

    const render = byId.get("#render");
    expect(render["@type"]).toBe("CreateAction");
    expect(render.instrument.map((r: any) => byId.get(r["@id"]).name)).toEqual(["Prooflight", "Vega", "Vega-Lite"]);
    expect(render.result.map((r: any) => r["@id"])).toEqual(expect.arrayContaining(["figure.svg", "figure.pdf", "figure.png"]));
    expect(render.object.map((r: any) => r["@id"])).toEqual(expect.arrayContaining(["specs/panel-a.vl.json", "specs/panel-b.vl.json"]));
    expect(byId.get(render.agent["@id"])).toEqual({ "@id": "#person-demo-viewer", "@type": "Person", name: "Luca Brenner" });

    expect(graph.filter((e) => e["@type"] === "AssessAction" && e["@id"].startsWith("#decision-")).map((e) => e.name)).toEqual([
      "Panel a, revision 1: approved",
      "Panel b, revision 1: approved",
    ]);
    const endorse = graph.filter((e) => e["@type"] === "EndorseAction");
    expect(endorse.map((e) => [e.name, byId.get(e.agent["@id"]).name])).toEqual([
      ["Figure 1 signed off (withdrawn)", "Mira Halvorsen"],
      ["Figure 1 signed off", "Mira Halvorsen"],
    ]);
    for (const p of graph.filter((e) => e["@type"] === "Person")) expect(Object.keys(p).sort()).toEqual(["@id", "@type", "name"]);
  });

  it("carries prov.json, valid against the PROV-JSON schema, with the drawn files generated by the bundle's render", () => {
    const prov = JSON.parse(strFromU8(files["prov.json"]!));
    const validate = provSchemaValidator();
    expect(validate(prov), JSON.stringify(validate.errors)).toBe(true);
    for (const f of ["figure.svg", "figure.pdf", "figure.png"]) {
      const id = `nih:${sha256(files[f]!)}`;
      expect(prov.entity, f).toHaveProperty([id]);
      expect(Object.values(prov.wasGeneratedBy)).toContainEqual({ "prov:entity": id, "prov:activity": "pl:render/bundle" });
    }
  });

  it("is deterministic: the same figure gives the same bytes, fixed timestamps, the metadata naming every hash last", async () => {
    const again = await exportFile("format=bundle");
    expect(sha256(again)).toBe(sha256(bytes));
    // The zip is written as it is made, so sizes follow each entry; the central directory lists them all
    // (APPNOTE.TXT 6.3 §4.3.16 end record: signature 0x06054b50, entry count at +10, directory offset at +16;
    // §4.3.12 directory headers: signature 0x02014b50, time and date at +12, name length +28, extra +30,
    // comment +32, name at +46). Walked one by one: one stamp for all.
    const view = Buffer.from(bytes);
    const end = view.lastIndexOf(Buffer.from([0x50, 0x4b, 0x05, 0x06]));
    const count = view.readUInt16LE(end + 10);
    const stamps = new Set<string>();
    const listed: string[] = [];
    for (let at = view.readUInt32LE(end + 16), i = 0; i < count; i++) {
      expect(view.readUInt32LE(at)).toBe(0x02014b50);
      stamps.add(view.subarray(at + 12, at + 16).toString("hex"));
      const nameLength = view.readUInt16LE(at + 28);
      listed.push(view.toString("utf8", at + 46, at + 46 + nameLength));
      at += 46 + nameLength + view.readUInt16LE(at + 30) + view.readUInt16LE(at + 32);
    }
    expect([...listed].sort()).toEqual(Object.keys(files).sort());
    expect(listed.at(-1)).toBe("ro-crate-metadata.json");
    // Written to a temporary file as it was made; nothing of it is left once it has been handed out.
    expect(fs.readdirSync(path.join(process.env.UPLOADS_DIR!, "tmp"))).toEqual([]);
    expect(stamps.size).toBe(1);
  });
});
