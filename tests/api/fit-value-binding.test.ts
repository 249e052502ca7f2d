import { beforeAll, describe, expect, it } from "vitest";
import { DEMO_MANUSCRIPT_ID } from "@/lib/demo-data/accounts";
import { hahnEchoFiles } from "@/lib/demo-data/hahn-echo";
import { revisionContentHash } from "@/lib/server/figures/bindings";
import * as upload from "@/app/api/manuscripts/[id]/datasets/route";
import * as analyses from "@/app/api/analyses/route";
import * as figuresRoute from "@/app/api/figures/route";
import * as panelsRoute from "@/app/api/figures/[id]/panels/route";
import * as revisions from "@/app/api/panels/[id]/revisions/route";
import * as revisionData from "@/app/api/revisions/[id]/data/route";
import { call, setupTestApp, uploadForm, type Who } from "./harness";

let tokens: Record<Who, string>;
let freeFit: string;
let fixedFit: string;
const VL = "https://vega.github.io/schema/vega-lite/v6.json";
const spec = {
  $schema: VL,
  layer: [
    {
      data: { name: "fit" },
      transform: [{ filter: "datum['series'] === 'curve'" }],
      mark: "line",
      encoding: { x: { field: "tau", type: "quantitative" }, y: { field: "signal", type: "quantitative" } },
    },
    {
      data: { name: "fitValue" },
      transform: [{ filter: { field: "name", equal: "T2" } }],
      mark: { type: "text", align: "right", baseline: "top", x: "width", y: 0, dx: -4, dy: 4 },
      encoding: { text: { field: "text", type: "nominal" } },
    },
  ],
};

beforeAll(async () => {
  ({ tokens } = await setupTestApp());
  const echo = hahnEchoFiles()[0]!;
  const versionId = (
    await call(upload.POST, { method: "POST", token: tokens.author, params: { id: DEMO_MANUSCRIPT_ID }, rawBody: uploadForm(echo.fileName, echo.content) })
  ).json.id as string;
  const fit = async (options: Record<string, unknown>) =>
    (await call(analyses.POST, { method: "POST", token: tokens.author, body: { versionId, model: "hahn_echo", options } })).json.id as string;
  freeFit = await fit({ x: "tau", y: "signal", sigma: "sigma" });
  fixedFit = await fit({ x: "tau", y: "signal", sigma: "sigma", fixed: { n: 1 } });
}, 120_000);

async function save(analysisId: string) {
  const f = await call(figuresRoute.POST, { method: "POST", token: tokens.author, body: { manuscriptId: DEMO_MANUSCRIPT_ID, title: "Fitted value" } });
  const p = await call(panelsRoute.POST, { method: "POST", token: tokens.author, params: { id: f.json.id }, body: { title: "echo" } });
  return call(revisions.POST, {
    method: "POST",
    token: tokens.author,
    params: { id: p.json.id },
    body: {
      spec,
      bindings: { fit: { analysisId, output: "curve" }, fitValue: { analysisId, output: "parameters" } },
      baseRevisionId: null,
      message: "T₂ on the plot",
    },
  });
}

describe("a fitted value bound to its stored run", () => {
  it("saves, and the data name gives one row per parameter with the text to draw", async () => {
    const r = await save(freeFit);
    expect(r.status).toBe(201);
    expect(r.json.bound.fitValue).toMatchObject({ kind: "analysis", id: freeFit, output: "parameters" });
    const data = await call(revisionData.GET, { token: tokens.reviewer, params: { id: r.json.id } });
    expect(data.status).toBe(200);
    const rows = data.json.data.fitValue.rows as Array<Record<string, unknown>>;
    expect(rows.map((x) => x.name)).toEqual(["S0", "A", "T2", "n"]);
    expect(rows.find((x) => x.name === "T2")!.text).toMatch(/^T₂ = \d+(\.\d+)? ± \d+(\.\d+)? µs$/);
    expect(data.json.warnings).toEqual([]);
  });

  it("another run of the same data gives another content hash", async () => {
    const a = await save(freeFit);
    const b = await save(fixedFit);
    expect(a.json.contentHash).not.toBe(b.json.contentHash);
    expect(a.json.bound.fitValue.resultSha256).not.toBe(b.json.bound.fitValue.resultSha256);
  });

  it("refuses a field the parameter rows lack", async () => {
    const f = await call(figuresRoute.POST, { method: "POST", token: tokens.author, body: { manuscriptId: DEMO_MANUSCRIPT_ID, title: "Wrong field" } });
    const p = await call(panelsRoute.POST, { method: "POST", token: tokens.author, params: { id: f.json.id }, body: { title: "echo" } });
    const wrong = { $schema: VL, data: { name: "fitValue" }, mark: "text", encoding: { text: { field: "label", type: "nominal" } } };
    const r = await call(revisions.POST, {
      method: "POST",
      token: tokens.author,
      params: { id: p.json.id },
      body: { spec: wrong, bindings: { fitValue: { analysisId: freeFit, output: "parameters" } }, baseRevisionId: null, message: "" },
    });
    expect(r.status).toBe(422);
  });
});

describe("revisionContentHash", () => {
  const bound = (resultSha256?: string) => ({
    fitValue: { kind: "analysis" as const, id: "a1", versionId: "v1", sha256: "f".repeat(64), output: "parameters", ...(resultSha256 ? { resultSha256 } : {}) },
  });
  it("follows the parameters' hash", () => {
    expect(revisionContentHash({}, bound("1".repeat(64)))).not.toBe(revisionContentHash({}, bound("2".repeat(64))));
  });
});
