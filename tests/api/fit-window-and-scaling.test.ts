/**
 * A fit window (options.xRange) is applied, stored with the run and shown on it; a bad window is refused
 * naming the field, with nothing stored. Decoupling scaling reads each chosen run's stored T2 ± error.
 * Expected counts come from the demo file's own τ column, read here with a plain split.
 */
import { beforeAll, describe, expect, it } from "vitest";
import { DEMO_MANUSCRIPT_ID } from "@/lib/demo-data/accounts";
import { hahnEchoFiles } from "@/lib/demo-data/hahn-echo";
import * as upload from "@/app/api/manuscripts/[id]/datasets/route";
import * as analyses from "@/app/api/analyses/route";
import * as preview from "@/app/api/analyses/preview/route";
import * as analysis from "@/app/api/analyses/[id]/route";
import * as versionRuns from "@/app/api/versions/[id]/analyses/route";
import * as scaling from "@/app/api/analyses/scaling/route";
import * as raw from "@/app/api/versions/[id]/raw/route";
import { call, setupTestApp, uploadForm, type Who } from "./harness";

let tokens: Record<Who, string>;
const files = hahnEchoFiles().slice(0, 4);
const versionIds: string[] = [];

/** τ values of a demo echo file: the first field of each data row (rows after the header line starting "tau"). */
const tauOf = (content: string): number[] => {
  const lines = content.split("\n").filter((l) => l && !l.startsWith("#"));
  return lines.slice(1).map((l) => Number(l.split(",")[0]));
};

beforeAll(async () => {
  ({ tokens } = await setupTestApp());
  for (const f of files) {
    const r = await call(upload.POST, {
      method: "POST",
      token: tokens.author,
      params: { id: DEMO_MANUSCRIPT_ID },
      rawBody: uploadForm(f.fileName, f.content, { name: f.name, metadata: JSON.stringify({ kind: f.kind, tags: f.tags }) }),
    });
    versionIds.push(r.json.id);
  }
});

const echoFit = (versionId: string, xRange?: unknown) => ({
  versionId,
  model: "hahn_echo",
  options: { x: "tau", y: "signal", sigma: "sigma", ...(xRange ? { xRange } : {}) },
});

describe("fit window", () => {
  it("fits only the points inside, returns the others to draw faded, and stores the window with the run", async () => {
    const tau = tauOf(files[0]!.content);
    const inside = tau.filter((t) => t >= 2 && t <= 400).length;
    expect(inside).toBeGreaterThan(20);
    const r = await call(analyses.POST, { method: "POST", token: tokens.author, body: echoFit(versionIds[0]!, [2, 400]) });
    expect(r.status).toBe(201);
    expect(r.json.points).toBe(inside);
    expect(r.json.data.x.every((t: number) => t >= 2 && t <= 400)).toBe(true);
    expect(r.json.data.outside.x).toHaveLength(tau.length - inside);
    expect(r.json.data.outside.x.every((t: number) => t < 2 || t > 400)).toBe(true);
    const stored = await call(analysis.GET, { token: tokens.viewer, params: { id: r.json.id } });
    expect(stored.json.options.xRange).toEqual([2, 400]);
    const listed = await call(versionRuns.GET, { token: tokens.viewer, params: { id: versionIds[0]! } });
    expect(listed.json.items.find((a: { id: string }) => a.id === r.json.id).options.xRange).toEqual([2, 400]);
    // The derived file says so in its header, and holds only the fitted points.
    const file = await call(raw.GET, { token: tokens.viewer, params: { id: r.json.derivedVersionId } });
    expect(file.status).toBe(200);
    const text = String(file.json);
    expect(text).toContain("# fit window: only points with tau from 2 to 400 µs were fitted (the data rows below)\n");
    expect(text.split("\n").filter((l) => l.startsWith("data,"))).toHaveLength(inside);
  });

  it("a fit without a window sends no faded points", async () => {
    const r = await call(preview.POST, { method: "POST", token: tokens.author, body: echoFit(versionIds[0]!) });
    expect(r.status).toBe(200);
    expect(r.json.data.outside).toBeUndefined();
    expect(r.json.points).toBe(tauOf(files[0]!.content).length);
  });

  it("refuses a window that runs backwards or holds no point, naming options.xRange, and stores nothing", async () => {
    const before = (await call(versionRuns.GET, { token: tokens.viewer, params: { id: versionIds[1]! } })).json.items.length;
    const backwards = await call(analyses.POST, { method: "POST", token: tokens.author, body: echoFit(versionIds[1]!, [400, 2]) });
    expect(backwards.status).toBe(400);
    expect(backwards.json.error.message).toBe("options.xRange: the fit window's start must be below its end");
    const empty = await call(analyses.POST, { method: "POST", token: tokens.author, body: echoFit(versionIds[1]!, [5000, 6000]) });
    expect(empty.status).toBe(400);
    expect(empty.json.error.message).toBe("options.xRange: no usable point of version 1 has tau between 5000 and 6000.");
    expect((await call(versionRuns.GET, { token: tokens.viewer, params: { id: versionIds[1]! } })).json.items).toHaveLength(before);
  });
});

describe("decoupling scaling over stored runs", () => {
  it("takes each run's stored T2 ± standard error at the N given, in µs", async () => {
    const runs = [];
    for (const id of versionIds) runs.push((await call(analyses.POST, { method: "POST", token: tokens.author, body: echoFit(id) })).json);
    const t2 = runs.map((r) => r.parameters.find((p: { name: string }) => p.name === "T2"));
    const body = { manuscriptId: DEMO_MANUSCRIPT_ID, runs: runs.map((r, k) => ({ analysisId: r.id, pulses: 2 ** k })) };
    const r = await call(scaling.POST, { method: "POST", token: tokens.author, body });
    expect(r.status).toBe(200);
    expect(r.json.unit).toBe("µs");
    expect(r.json.points.map((p: { pulses: number; value: number; stderr: number }) => [p.pulses, p.value, p.stderr])).toEqual(
      t2.map((p, k) => [2 ** k, p.value, p.stderr]),
    );
    expect(r.json.fit.dof).toBe(2);
    expect(r.json.curve.pulses[0]).toBe(1);
    expect(r.json.curve.pulses.at(-1)).toBeCloseTo(8, 12);
    // A viewer may not run it.
    expect((await call(scaling.POST, { method: "POST", token: tokens.viewer, body })).status).toBe(403);
  });
});
