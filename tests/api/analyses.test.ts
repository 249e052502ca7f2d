import { beforeAll, describe, expect, it } from "vitest";
import { DEMO_MANUSCRIPT_ID } from "@/lib/demo-data/accounts";
import { hahnEchoFiles } from "@/lib/demo-data/hahn-echo";
import * as upload from "@/app/api/manuscripts/[id]/datasets/route";
import * as analyses from "@/app/api/analyses/route";
import * as preview from "@/app/api/analyses/preview/route";
import * as analysis from "@/app/api/analyses/[id]/route";
import * as models from "@/app/api/analysis-models/route";
import * as rows from "@/app/api/versions/[id]/rows/route";
import * as version from "@/app/api/versions/[id]/route";
import * as dataset from "@/app/api/datasets/[id]/route";
import * as statistics from "@/app/api/manuscripts/[id]/statistics/route";
import * as calculator from "@/app/api/calculators/[id]/route";
import { call, setupTestApp, uploadForm, type Who } from "./harness";

let tokens: Record<Who, string>;
const echoVersions: Array<{ id: string; trueT2: number; group: string }> = [];

beforeAll(async () => {
  ({ tokens } = await setupTestApp());
  for (const f of hahnEchoFiles()) {
    const r = await call(upload.POST, {
      method: "POST",
      token: tokens.author,
      params: { id: DEMO_MANUSCRIPT_ID },
      rawBody: uploadForm(f.fileName, f.content, { name: f.name, metadata: JSON.stringify({ kind: f.kind, tags: f.tags }) }),
    });
    echoVersions.push({ id: r.json.id, trueT2: Number(/true T2 = ([\d.]+)/.exec(f.notes)![1]), group: f.tags.group! });
  }
});

const echoFit = (versionId: string, extra: Record<string, unknown> = {}) => ({
  versionId,
  model: "hahn_echo",
  options: { x: "tau", y: "signal", sigma: "sigma", ...extra },
});

describe("analyses", () => {
  it("lists models and calculators with units", async () => {
    const r = await call(models.GET, { token: tokens.viewer });
    const echo = r.json.items.find((m: any) => m.id === "hahn_echo");
    expect(echo.parameters.map((p: any) => [p.name, p.unit])).toEqual([
      ["S0", "y"],
      ["A", "y"],
      ["T2", "x"],
      ["n", "1"],
    ]);
    expect(r.json.calculators.length).toBeGreaterThan(10);
  });

  it("fits a Hahn echo, stores the run with its input hash and writes a derived version", async () => {
    const v = echoVersions[0]!;
    const r = await call(analyses.POST, { method: "POST", token: tokens.author, body: echoFit(v.id) });
    expect(r.status).toBe(201);
    const t2 = r.json.parameters.find((p: any) => p.name === "T2");
    expect(t2.unit).toBe("µs");
    expect(Math.abs(t2.value - v.trueT2)).toBeLessThan(3 * t2.stderr);
    expect(r.json).toMatchObject({ model: "hahn_echo", converged: true });
    expect(r.json.chi2red).toBeGreaterThan(0.3);
    expect(r.json.chi2red).toBeLessThan(3);
    const stored = await call(analysis.GET, { token: tokens.reviewer, params: { id: r.json.id } });
    expect(stored.json).toMatchObject({ versionId: v.id, model: "hahn_echo", derivedVersionId: r.json.derivedVersionId });
    expect(stored.json.inputSha256).toMatch(/^[0-9a-f]{64}$/);
    expect(stored.json.modelVersion).toBeTruthy();
    const derived = await call(rows.GET, { token: tokens.reviewer, params: { id: r.json.derivedVersionId }, path: "/x?offset=0&limit=2" });
    expect(derived.json.names).toEqual(["series", "tau", "signal"]);
    expect(derived.json.rows[0][0]).toBe("curve");
  });

  it("a second run of the same model makes a new version of the same derived dataset", async () => {
    const v = echoVersions[0]!;
    const first = await call(analyses.POST, { method: "POST", token: tokens.author, body: echoFit(v.id, { fixed: { n: 2 } }) });
    const second = await call(analyses.POST, { method: "POST", token: tokens.author, body: echoFit(v.id, { fixed: { n: 1.5 } }) });
    expect(first.json.parameters.find((p: any) => p.name === "n")).toMatchObject({ value: 2, fixed: true, stderr: 0 });
    const a = (await call(version.GET, { token: tokens.pi, params: { id: first.json.derivedVersionId } })).json;
    const b = (await call(version.GET, { token: tokens.pi, params: { id: second.json.derivedVersionId } })).json;
    expect(b.datasetId).toBe(a.datasetId);
    expect(b.number).toBe(a.number + 1);
    const ds = await call(dataset.GET, { token: tokens.pi, params: { id: a.datasetId } });
    expect(ds.json.tags).toMatchObject({ model: "hahn_echo", group: echoVersions[0]!.group });
  });

  it("preview stores nothing; bad options name the field", async () => {
    const v = echoVersions[1]!;
    const p = await call(preview.POST, { method: "POST", token: tokens.pi, body: echoFit(v.id, { start: { T2: 100 }, bounds: { n: [1, 3] } }) });
    expect(p.status).toBe(200);
    expect(p.json.id).toBeUndefined();
    expect(p.json.curve.x).toHaveLength(400);
    // The σ column travels with the points, for the fit plot's error bars.
    expect(p.json.data.sigma).toHaveLength(p.json.data.x.length);
    expect(p.json.data.sigma.every((s: number) => s > 0)).toBe(true);
    const badModel = await call(analyses.POST, { method: "POST", token: tokens.pi, body: { ...echoFit(v.id), model: "nope" } });
    expect(badModel.status).toBe(400);
    expect(badModel.json.error.message).toMatch(/^model: unknown model "nope"/);
    const badColumn = await call(analyses.POST, { method: "POST", token: tokens.pi, body: { ...echoFit(v.id), options: { x: "time", y: "signal" } } });
    expect(badColumn.status).toBe(400);
    expect(badColumn.json.error.message).toMatch(/options\.x: no numeric column named "time".*tau, signal, sigma/);
    const badParam = await call(analyses.POST, { method: "POST", token: tokens.pi, body: echoFit(v.id, { start: { T3: 1 } }) });
    expect(badParam.status).toBe(400);
    expect(badParam.json.error.message).toMatch(/^options\.start: unknown parameter "T3"/);
    const badBounds = await call(analyses.POST, { method: "POST", token: tokens.pi, body: echoFit(v.id, { bounds: { T2: [5, 1] } }) });
    expect(badBounds.status).toBe(400);
    const extra = await call(analyses.POST, { method: "POST", token: tokens.pi, body: echoFit(v.id, { colour: "red" }) });
    expect(extra.status).toBe(400);
  });

  it("viewers and reviewers may not run analyses; outsiders get 404", async () => {
    const v = echoVersions[2]!;
    expect((await call(analyses.POST, { method: "POST", token: tokens.viewer, body: echoFit(v.id) })).status).toBe(403);
    expect((await call(analyses.POST, { method: "POST", token: tokens.reviewer, body: echoFit(v.id) })).status).toBe(403);
    expect((await call(analyses.POST, { method: "POST", token: tokens.outsider, body: echoFit(v.id) })).status).toBe(404);
  });

  it("population statistics of T2 by sample group over the current runs", async () => {
    for (const v of echoVersions) await call(analyses.POST, { method: "POST", token: tokens.author, body: echoFit(v.id) });
    const r = await call(statistics.GET, { token: tokens.reviewer, params: { id: DEMO_MANUSCRIPT_ID }, path: "/x?model=hahn_echo&parameter=T2&groupBy=group" });
    expect(r.status).toBe(200);
    expect(r.json.unit).toBe("µs");
    expect(r.json.groups.map((g: any) => [g.group, g.n])).toEqual([
      ["annealed-1200C", 4],
      ["as-grown", 4],
      ["oxygen-terminated", 4],
    ]);
    const asGrown = r.json.groups.find((g: any) => g.group === "as-grown");
    const oxygen = r.json.groups.find((g: any) => g.group === "oxygen-terminated");
    expect(oxygen.mean).toBeGreaterThan(asGrown.mean);
    expect(r.json.comparisons).toHaveLength(3);
    const c = r.json.comparisons.find((x: any) => x.a === "as-grown" && x.b === "oxygen-terminated");
    expect(c.welch.p).toBeLessThan(0.05);
    const bad = await call(statistics.GET, { token: tokens.reviewer, params: { id: DEMO_MANUSCRIPT_ID }, path: "/x?model=hahn_echo&parameter=T9" });
    expect(bad.status).toBe(400);
  });

  it("calculators: ODMR pair → field (f₋ = 2750, f₊ = 2990 MHz → B = (f₊ − f₋)/(2γ_NV) = 240/(2 × 28.0317) = 4.2809 mT)", async () => {
    const r = await call(calculator.POST, {
      method: "POST",
      token: tokens.viewer,
      params: { id: "odmr-field-from-pair" },
      body: { inputs: { f_minus: 2750, f_plus: 2990 } },
    });
    expect(r.status).toBe(200);
    expect(r.json.outputs.B).toBeCloseTo(4.2809, 4);
    expect(r.json.caution).toMatch(/estimate, not a calibration/);
    const bad = await call(calculator.POST, {
      method: "POST",
      token: tokens.viewer,
      params: { id: "odmr-field-from-pair" },
      body: { inputs: { f_minus: "x" } },
    });
    expect(bad.status).toBe(400);
    expect(bad.json.error.message).toMatch(/^inputs\.f_minus/);
    expect((await call(calculator.POST, { method: "POST", token: tokens.viewer, params: { id: "nope" }, body: { inputs: {} } })).status).toBe(404);
  });
});
