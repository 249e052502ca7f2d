import { beforeAll, describe, expect, it } from "vitest";
import { DEMO_MANUSCRIPT_ID } from "@/lib/demo-data/accounts";
import { getDb } from "@/db/client";
import { verifyAuditChain } from "@/lib/server/audit";
import * as upload from "@/app/api/manuscripts/[id]/datasets/route";
import * as datasetsList from "@/app/api/manuscripts/[id]/datasets/route";
import * as figuresList from "@/app/api/manuscripts/[id]/figures/route";
import * as activity from "@/app/api/manuscripts/[id]/activity/route";
import * as figuresRoute from "@/app/api/figures/route";
import * as figure from "@/app/api/figures/[id]/route";
import * as figureArchive from "@/app/api/figures/[id]/archive/route";
import * as trace from "@/app/api/figures/[id]/trace/route";
import * as panelsRoute from "@/app/api/figures/[id]/panels/route";
import * as panel from "@/app/api/panels/[id]/route";
import * as panelArchive from "@/app/api/panels/[id]/archive/route";
import * as revisions from "@/app/api/panels/[id]/revisions/route";
import * as sendToReview from "@/app/api/panels/[id]/send-to-review/route";
import * as approvals from "@/app/api/panels/[id]/approvals/route";
import * as signoff from "@/app/api/figures/[id]/signoff/route";
import * as withdraw from "@/app/api/figures/[id]/signoff/withdraw/route";
import * as queue from "@/app/api/review-queue/route";
import * as dataset from "@/app/api/datasets/[id]/route";
import * as datasetArchive from "@/app/api/datasets/[id]/archive/route";
import * as analysesRoute from "@/app/api/analyses/route";
import * as analysis from "@/app/api/analyses/[id]/route";
import * as analysisArchive from "@/app/api/analyses/[id]/archive/route";
import * as versionAnalyses from "@/app/api/versions/[id]/analyses/route";
import { call, setupTestApp, uploadForm, type Who } from "./harness";
import { T1_CSV, T1_SPEC } from "./t1-fixture";

let tokens: Record<Who, string>;
const post = (h: any, who: Who, params: Record<string, string>, body?: unknown) => call(h, { method: "POST", token: tokens[who], params, body });
const get = (h: any, who: Who, params: Record<string, string>, path?: string) => call(h, { token: tokens[who], params, path });

let versionId: string, datasetId: string, figureId: string, panelId: string, revisionId: string;
beforeAll(async () => {
  ({ tokens } = await setupTestApp());
  const v = (await call(upload.POST, { method: "POST", token: tokens.author, params: { id: DEMO_MANUSCRIPT_ID }, rawBody: uploadForm("t1.csv", T1_CSV) })).json;
  ({ id: versionId, datasetId } = v);
  figureId = (await post(figuresRoute.POST, "author", {}, { manuscriptId: DEMO_MANUSCRIPT_ID, title: "Relaxation" })).json.id;
  panelId = (await post(panelsRoute.POST, "author", { id: figureId }, { title: "T1 of NV07" })).json.id;
  revisionId = (await post(revisions.POST, "author", { id: panelId }, { spec: T1_SPEC, bindings: { t1: { versionId } }, baseRevisionId: null })).json.id;
  await post(sendToReview.POST, "author", { id: panelId });
  expect((await post(approvals.POST, "reviewer", { id: panelId }, { revisionId, decision: "approved" })).status).toBe(201);
});

describe("withdrawing a sign-off", () => {
  it("keeps it on record, marked withdrawn with who and why; the figure is no longer signed off anywhere", async () => {
    const before = (await get(figure.GET, "pi", { id: figureId })).json;
    const s = await post(signoff.POST, "pi", { id: figureId }, { figureHash: before.figureHash });
    expect(s.status).toBe(201);
    expect((await get(figure.GET, "viewer", { id: figureId })).json.reviewState).toBe("signed_off");

    expect((await post(withdraw.POST, "author", { id: figureId }, { signoffId: s.json.id, reason: "no" })).status).toBe(403);
    const w = await post(withdraw.POST, "pi", { id: figureId }, { signoffId: s.json.id, reason: "The T1 axis must start at zero." });
    expect(w.status).toBe(200);
    expect(w.json).toMatchObject({ id: s.json.id, figureId, withdrawReason: "The T1 axis must start at zero." });
    const again = await post(withdraw.POST, "pi", { id: figureId }, { signoffId: s.json.id, reason: "twice" });
    expect(again.status).toBe(409);
    expect(again.json.error.message).toBe("This sign-off was already withdrawn.");

    const after = (await get(figure.GET, "viewer", { id: figureId })).json;
    expect(after.reviewState).toBe("approved");
    expect(after.panels.map((p: any) => p.reviewState)).toEqual(["approved"]);
    expect(after.signoffs).toHaveLength(1);
    expect(after.signoffs[0]).toMatchObject({ withdrawn: true, withdrawnBy: "demo-pi", withdrawReason: "The T1 axis must start at zero.", stale: false });
    const m = (await get(figuresList.GET, "viewer", { id: DEMO_MANUSCRIPT_ID })).json.items.find((f: any) => f.id === figureId);
    expect(m.reviewState).toBe("approved");
    // The PI is asked to sign off again.
    const asked = (await get(queue.GET, "pi", {})).json.items.filter((i: any) => i.figureId === figureId);
    expect(asked.map((i: any) => i.kind)).toEqual(["signoff"]);
    const log = (await get(activity.GET, "viewer", { id: DEMO_MANUSCRIPT_ID })).json.items.map((e: any) => `${e.actor} ${e.text}`);
    expect(log[0]).toBe(`Mira Halvorsen withdrew a sign-off (hash ${before.figureHash.slice(0, 12)}…) — reason: “The T1 axis must start at zero.”`);
    expect((await verifyAuditChain(getDb())).ok).toBe(true);
  });
});

describe("archive and restore", () => {
  it("a dataset leaves the list and stays resolvable; deleting it is refused while a revision binds it", async () => {
    expect((await post(datasetArchive.POST, "reviewer", { id: datasetId }, { archived: true })).status).toBe(403);
    expect((await post(datasetArchive.POST, "author", { id: datasetId }, { archived: true })).status).toBe(200);
    const listed = (await get(datasetsList.GET, "viewer", { id: DEMO_MANUSCRIPT_ID })).json.items.map((d: any) => d.id);
    expect(listed).not.toContain(datasetId);
    const archived = (await get(datasetsList.GET, "viewer", { id: DEMO_MANUSCRIPT_ID }, `/api/manuscripts/${DEMO_MANUSCRIPT_ID}/datasets?archived=1`)).json
      .items;
    expect(archived.map((d: any) => d.id)).toEqual([datasetId]);
    const d = await get(dataset.GET, "viewer", { id: datasetId });
    expect(d.status).toBe(200);
    expect(d.json.archivedAt).toBeTruthy();
    const t = (await get(trace.GET, "viewer", { id: figureId })).json;
    expect(JSON.stringify(t)).toContain(versionId);

    expect((await call(dataset.DELETE, { method: "DELETE", token: tokens.author, params: { id: datasetId } })).status).toBe(403);
    const refused = await call(dataset.DELETE, { method: "DELETE", token: tokens.pi, params: { id: datasetId } });
    expect(refused.status).toBe(409);
    expect(refused.json.error.message).toBe("Dataset “t1.csv” cannot be deleted: Figure 1a, revision 1 binds a version of it. It stays archived.");
    expect(refused.json.error.details).toEqual({ references: ["Figure 1a, revision 1 binds a version of it"] });

    expect((await post(datasetArchive.POST, "author", { id: datasetId }, { archived: false })).status).toBe(200);
    expect((await get(datasetsList.GET, "viewer", { id: DEMO_MANUSCRIPT_ID })).json.items.map((x: any) => x.id)).toContain(datasetId);
    const notArchived = await call(dataset.DELETE, { method: "DELETE", token: tokens.pi, params: { id: datasetId } });
    expect(notArchived.json.error.message).toBe("Archive dataset “t1.csv” before deleting it for good.");
  });

  it("a stored run leaves the version's list; deleted for good once archived and bound nowhere", async () => {
    const run = (
      await call(analysesRoute.POST, { method: "POST", token: tokens.author, body: { versionId, model: "relaxation", options: { x: "wait", y: "p" } } })
    ).json;
    await post(analysisArchive.POST, "author", { id: run.id }, { archived: true });
    expect((await get(versionAnalyses.GET, "viewer", { id: versionId })).json.items).toEqual([]);
    const archived = (await get(versionAnalyses.GET, "viewer", { id: versionId }, `/api/versions/${versionId}/analyses?archived=1`)).json.items;
    expect(archived.map((a: any) => a.id)).toEqual([run.id]);
    expect((await call(analysis.DELETE, { method: "DELETE", token: tokens.pi, params: { id: run.id } })).status).toBe(200);
    expect((await get(analysis.GET, "pi", { id: run.id })).status).toBe(404);
    const log = (await get(activity.GET, "viewer", { id: DEMO_MANUSCRIPT_ID })).json.items.map((e: any) => `${e.actor} ${e.text}`);
    expect(log.slice(0, 2)).toEqual([
      `Mira Halvorsen deleted the stored relaxation run ${run.id} for good`,
      `Tomás Ekberg archived the stored relaxation run ${run.id}`,
    ]);
  });

  it("a panel leaves its figure (letters and hash follow) and its page still opens; one with decisions is never deleted", async () => {
    const second = (await post(panelsRoute.POST, "author", { id: figureId }, { title: "spare" })).json.id;
    const before = (await get(figure.GET, "viewer", { id: figureId })).json;
    expect(before.panels.map((p: any) => p.letter)).toEqual(["a", "b"]);
    await post(panelArchive.POST, "author", { id: panelId }, { archived: true });
    const after = (await get(figure.GET, "viewer", { id: figureId })).json;
    expect(after.panels.map((p: any) => [p.id, p.letter])).toEqual([[second, "a"]]);
    expect(after.archivedPanels.map((p: any) => p.id)).toEqual([panelId]);
    expect(after.figureHash).not.toBe(before.figureHash);
    const p = await get(panel.GET, "viewer", { id: panelId });
    expect(p.status).toBe(200);
    expect(p.json).toMatchObject({ letter: "a", currentRevision: { id: revisionId }, reviewState: "approved" });
    expect(p.json.decisions.map((d: any) => d.decision)).toEqual(["approved"]);
    const refused = await call(panel.DELETE, { method: "DELETE", token: tokens.pi, params: { id: panelId } });
    expect(refused.status).toBe(409);
    expect(refused.json.error.details.references).toEqual(["1 review decision", "1 sign-off of the figure"]);
    const decided = await post(approvals.POST, "reviewer", { id: panelId }, { revisionId, decision: "needs_revision" });
    expect(decided.json.error.message).toBe("This panel is archived; restore it before deciding on it.");
    await post(panelArchive.POST, "author", { id: panelId }, { archived: false });
    expect((await get(figure.GET, "viewer", { id: figureId })).json.panels.map((x: any) => x.id)).toEqual([panelId, second]);
    await post(panelArchive.POST, "author", { id: second }, { archived: true });
    expect((await call(panel.DELETE, { method: "DELETE", token: tokens.pi, params: { id: second } })).status).toBe(200);
  });

  it("a figure leaves the manuscript's list, opens by its link, and lists among the archived", async () => {
    await post(figureArchive.POST, "author", { id: figureId }, { archived: true });
    expect((await get(figuresList.GET, "viewer", { id: DEMO_MANUSCRIPT_ID })).json.items.map((f: any) => f.id)).not.toContain(figureId);
    const archived = (await get(figuresList.GET, "viewer", { id: DEMO_MANUSCRIPT_ID }, `/api/manuscripts/${DEMO_MANUSCRIPT_ID}/figures?archived=1`)).json.items;
    expect(archived.map((f: any) => f.id)).toEqual([figureId]);
    const f = await get(figure.GET, "reviewer", { id: figureId });
    expect(f.status).toBe(200);
    expect(f.json.archivedAt).toBeTruthy();
    // Nobody waits on an archived figure.
    expect((await get(queue.GET, "pi", {})).json.items.filter((i: any) => i.figureId === figureId)).toEqual([]);
    const refused = await call(figure.DELETE, { method: "DELETE", token: tokens.pi, params: { id: figureId } });
    expect(refused.json.error.message).toBe("Figure 1 “Relaxation” cannot be deleted: 1 review decision; 1 sign-off of the figure. It stays archived.");
    expect((await verifyAuditChain(getDb())).ok).toBe(true);
  });
});
