import { beforeAll, describe, expect, it } from "vitest";
import { DEMO_MANUSCRIPT_ID, OTHER_MANUSCRIPT_ID } from "@/lib/demo-data/accounts";
import * as upload from "@/app/api/manuscripts/[id]/datasets/route";
import * as figuresRoute from "@/app/api/figures/route";
import * as figure from "@/app/api/figures/[id]/route";
import * as panelsRoute from "@/app/api/figures/[id]/panels/route";
import * as order from "@/app/api/figures/[id]/order/route";
import * as panel from "@/app/api/panels/[id]/route";
import * as sendToReview from "@/app/api/panels/[id]/send-to-review/route";
import * as revisions from "@/app/api/panels/[id]/revisions/route";
import * as trace from "@/app/api/figures/[id]/trace/route";
import { call, setupTestApp, uploadForm, type Who } from "./harness";

let tokens: Record<Who, string>;
let versionId: string;
let otherVersionId: string;
const spec = (extra: Record<string, unknown> = {}) => ({
  $schema: "https://vega.github.io/schema/vega-lite/v6.json",
  data: { name: "echo" },
  mark: "point",
  encoding: { x: { field: "tau", type: "quantitative", title: "τ (µs)" }, y: { field: "signal", type: "quantitative" } },
  ...extra,
});

beforeAll(async () => {
  ({ tokens } = await setupTestApp());
  const up = (who: Who, id: string, text: string) =>
    call(upload.POST, { method: "POST", token: tokens[who], params: { id }, rawBody: uploadForm("echo.csv", text) });
  versionId = (await up("author", DEMO_MANUSCRIPT_ID, "tau (µs),signal\n1,0.9\n2,0.8\n")).json.id;
  otherVersionId = (await up("outsider", OTHER_MANUSCRIPT_ID, "tau (µs),signal\n1,0.5\n")).json.id;
});

async function newPanel() {
  const f = await call(figuresRoute.POST, {
    method: "POST",
    token: tokens.author,
    body: { manuscriptId: DEMO_MANUSCRIPT_ID, title: "Coherence", widthMm: 89 },
  });
  const p = await call(panelsRoute.POST, { method: "POST", token: tokens.author, params: { id: f.json.id }, body: { title: "echo" } });
  return { figureId: f.json.id as string, panelId: p.json.id as string };
}
const revise = (panelId: string, body: Record<string, unknown>, who: Who = "author") =>
  call(revisions.POST, { method: "POST", token: tokens[who], params: { id: panelId }, body: { bindings: { echo: { versionId } }, message: "m", ...body } });

describe("figures, panels and revisions", () => {
  it("numbers figures and letters panels; reordering re-letters", async () => {
    const f = await call(figuresRoute.POST, { method: "POST", token: tokens.author, body: { manuscriptId: DEMO_MANUSCRIPT_ID, title: "Spectra" } });
    expect(f.status).toBe(201);
    expect(f.json).toMatchObject({ widthMm: 183, maxHeightMm: 170 });
    const letters = [];
    for (const t of ["PL", "ODMR", "NMR"])
      letters.push((await call(panelsRoute.POST, { method: "POST", token: tokens.author, params: { id: f.json.id }, body: { title: t } })).json.letter);
    expect(letters).toEqual(["a", "b", "c"]);
    const before = (await call(figure.GET, { token: tokens.viewer, params: { id: f.json.id } })).json.panels;
    const after = await call(order.POST, {
      method: "POST",
      token: tokens.author,
      params: { id: f.json.id },
      body: { panelIds: before.map((p: any) => p.id).reverse() },
    });
    expect(after.json.panels.map((p: any) => [p.letter, p.title])).toEqual([
      ["a", "NMR"],
      ["b", "ODMR"],
      ["c", "PL"],
    ]);
    const bad = await call(order.POST, { method: "POST", token: tokens.author, params: { id: f.json.id }, body: { panelIds: [before[0].id] } });
    expect(bad.status).toBe(400);
  });

  it("required reviewers must be members who may review", async () => {
    const { figureId } = await newPanel();
    const bad = await call(figure.PATCH, { method: "PATCH", token: tokens.pi, params: { id: figureId }, body: { requiredReviewers: ["demo-viewer"] } });
    expect(bad.status).toBe(400);
    expect(bad.json.error.message).toMatch(/^requiredReviewers: "demo-viewer"/);
    expect(
      (await call(figure.PATCH, { method: "PATCH", token: tokens.pi, params: { id: figureId }, body: { requiredReviewers: ["demo-reviewer"] } })).status,
    ).toBe(200);
  });

  it("a revision's content hash covers spec and bound data, not key order", async () => {
    const { panelId } = await newPanel();
    const r1 = await revise(panelId, { spec: spec(), baseRevisionId: null });
    expect(r1.status).toBe(201);
    expect(r1.json.number).toBe(1);
    expect(r1.json.contentHash).toMatch(/^[0-9a-f]{64}$/);
    expect(r1.json.bound.echo).toMatchObject({ kind: "version", versionId });
    const reordered = JSON.parse(JSON.stringify({ encoding: spec().encoding, mark: "point", data: { name: "echo" }, $schema: spec().$schema }));
    const r2 = await revise(panelId, { spec: reordered, baseRevisionId: r1.json.id });
    expect(r2.json.contentHash).toBe(r1.json.contentHash);
    const r3 = await revise(panelId, { spec: spec({ mark: "line" }), baseRevisionId: r2.json.id });
    expect(r3.json.contentHash).not.toBe(r1.json.contentHash);
    const p = await call(panel.GET, { token: tokens.reviewer, params: { id: panelId } });
    expect(p.json.currentRevision).toMatchObject({ id: r3.json.id, contentHash: r3.json.contentHash });
    // A new panel is a draft until its author sends it to review.
    expect(p.json.reviewState).toBe("draft");
    expect((await call(sendToReview.POST, { method: "POST", token: tokens.author, params: { id: panelId } })).status).toBe(200);
    expect((await call(panel.GET, { token: tokens.reviewer, params: { id: panelId } })).json.reviewState).toBe("in_review");
  });

  it("409 when the base revision is not the current one", async () => {
    const { panelId } = await newPanel();
    const r1 = await revise(panelId, { spec: spec(), baseRevisionId: null });
    await revise(panelId, { spec: spec({ mark: "line" }), baseRevisionId: r1.json.id });
    const stale = await revise(panelId, { spec: spec({ mark: "circle" }), baseRevisionId: r1.json.id });
    expect(stale.status).toBe(409);
    expect(stale.json.error.message).toMatch(/changed since you opened it/);
    const first = await revise(panelId, { spec: spec(), baseRevisionId: null });
    expect(first.status).toBe(409);
  });

  it("hostile or broken specs are refused with the place; bindings are checked", async () => {
    const { panelId } = await newPanel();
    const url = await revise(panelId, { spec: { ...spec(), data: { url: "http://127.0.0.1:3000/api/me" } }, baseRevisionId: null, bindings: {} });
    expect(url.status).toBe(422);
    expect(url.json.error.message).toMatch(/data/);
    const href = await revise(panelId, { spec: spec({ encoding: { ...spec().encoding, href: { value: "javascript:alert(1)" } } }), baseRevisionId: null });
    expect(href.status).toBe(422);
    expect(href.json.error.message).toMatch(/href/);
    const unbound = await revise(panelId, { spec: spec(), baseRevisionId: null, bindings: {} });
    expect(unbound.status).toBe(400);
    expect(unbound.json.error.message).toMatch(/"echo" with no binding/);
    const foreign = await revise(panelId, { spec: spec(), baseRevisionId: null, bindings: { echo: { versionId: otherVersionId } } });
    expect(foreign.status).toBe(400);
    expect(foreign.json.error.message).toMatch(/no such version in this manuscript/);
    const notObject = await revise(panelId, { spec: "mark: point", baseRevisionId: null });
    expect(notObject.status).toBe(400);
  });

  it("reviewers and viewers cannot edit; outsiders get 404", async () => {
    const { panelId } = await newPanel();
    expect((await revise(panelId, { spec: spec(), baseRevisionId: null }, "reviewer")).status).toBe(403);
    expect((await revise(panelId, { spec: spec(), baseRevisionId: null }, "viewer")).status).toBe(403);
    expect((await revise(panelId, { spec: spec(), baseRevisionId: null }, "outsider")).status).toBe(404);
    expect((await call(panel.GET, { token: tokens.outsider, params: { id: panelId } })).status).toBe(404);
  });

  it("the trace names every input by hash and the figure hash moves with any panel", async () => {
    const { figureId, panelId } = await newPanel();
    const r1 = await revise(panelId, { spec: spec(), baseRevisionId: null });
    const t1 = await call(trace.GET, { token: tokens.viewer, params: { id: figureId } });
    expect(t1.json.panels[0]).toMatchObject({ letter: "a", revision: { contentHash: r1.json.contentHash } });
    expect(t1.json.panels[0].inputs[0]).toMatchObject({ name: "echo", kind: "version", version: { versionId, fileName: "echo.csv", number: 1 } });
    await revise(panelId, { spec: spec({ mark: "line" }), baseRevisionId: r1.json.id });
    const t2 = await call(trace.GET, { token: tokens.viewer, params: { id: figureId } });
    expect(t2.json.figure.figureHash).not.toBe(t1.json.figure.figureHash);
  });
});
