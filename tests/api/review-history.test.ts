// A long review history: the board and the queue read only each person's latest decision on the
// current content and each thread's last mention and reply, and must say exactly what the whole
// history says. The expected states are worked out by hand from the sequence below.
import { beforeAll, describe, expect, it } from "vitest";
import { DEMO_MANUSCRIPT_ID } from "@/lib/demo-data/accounts";
import { commentDoc } from "@/lib/demo-data/story";
import { plainDoc } from "@/lib/review/rich-text";
import * as upload from "@/app/api/manuscripts/[id]/datasets/route";
import * as figuresRoute from "@/app/api/figures/route";
import * as panelsRoute from "@/app/api/figures/[id]/panels/route";
import * as panel from "@/app/api/panels/[id]/route";
import * as revisions from "@/app/api/panels/[id]/revisions/route";
import * as sendToReview from "@/app/api/panels/[id]/send-to-review/route";
import * as approvals from "@/app/api/panels/[id]/approvals/route";
import * as threads from "@/app/api/panels/[id]/threads/route";
import * as reply from "@/app/api/threads/[id]/comments/route";
import * as queue from "@/app/api/review-queue/route";
import * as manuscript from "@/app/api/manuscripts/[id]/route";
import { call, setupTestApp, uploadForm, type Who } from "./harness";

let tokens: Record<Who, string>;
let figureId: string, panelId: string, versionId: string;
const revisionIds: string[] = [];
const post = (h: any, who: Who, params: Record<string, string>, body: unknown) => call(h, { method: "POST", token: tokens[who], params, body });
const spec = (title: string) => ({
  $schema: "https://vega.github.io/schema/vega-lite/v6.json",
  data: { name: "echo" },
  mark: "point",
  title,
  encoding: { x: { field: "tau", type: "quantitative", title: "τ (µs)" }, y: { field: "signal", type: "quantitative", title: "signal (norm.)" } },
});

async function revise(title: string) {
  const r = await post(
    revisions.POST,
    "author",
    { id: panelId },
    { spec: spec(title), bindings: { echo: { versionId } }, baseRevisionId: revisionIds.at(-1) ?? null, message: title },
  );
  expect(r.status).toBe(201);
  revisionIds.push(r.json.id);
}

async function boardPanel() {
  const board = (await call(manuscript.GET, { token: tokens.viewer, params: { id: DEMO_MANUSCRIPT_ID } })).json;
  return board.figures.find((f: { id: string }) => f.id === figureId).panels[0];
}

const queueOf = async (who: Who) =>
  ((await call(queue.GET, { token: tokens[who] })).json.items as Array<{ kind: string; panelId?: string }>)
    .filter((i) => i.panelId === panelId)
    .map((i) => i.kind);

beforeAll(async () => {
  ({ tokens } = await setupTestApp());
  const v = await call(upload.POST, {
    method: "POST",
    token: tokens.author,
    params: { id: DEMO_MANUSCRIPT_ID },
    rawBody: uploadForm("history.csv", "tau (µs),signal\n1,0.9\n2,0.8\n"),
  });
  versionId = v.json.id;
  figureId = (await post(figuresRoute.POST, "author", {}, { manuscriptId: DEMO_MANUSCRIPT_ID, title: "History" })).json.id;
  panelId = (await post(panelsRoute.POST, "author", { id: figureId }, {})).json.id;
  await revise("first");
  expect((await post(sendToReview.POST, "author", { id: panelId }, undefined)).status).toBe(200);
});

describe("board and queue over a long review history", () => {
  it("60 decisions: the board shows each person's last word, and the panel still lists all 60", async () => {
    // Round k: the reviewer decides "approved" when k % 3 ≠ 2, the PI "needs revision" when k % 4 = 1, else "approved".
    for (let k = 0; k < 30; k++) {
      const a = await post(approvals.POST, "reviewer", { id: panelId }, { revisionId: revisionIds[0], decision: k % 3 === 2 ? "needs_revision" : "approved" });
      const b = await post(approvals.POST, "pi", { id: panelId }, { revisionId: revisionIds[0], decision: k % 4 === 1 ? "needs_revision" : "approved" });
      expect([a.status, b.status]).toEqual([201, 201]);
    }
    // The last round, k = 29: 29 % 3 = 2, so the reviewer asks for revision; 29 % 4 = 1, so the PI does too.
    expect(await boardPanel()).toMatchObject({ reviewState: "needs_revision", approvedBy: [], needsRevisionBy: ["demo-pi", "demo-reviewer"] });
    const history = (await call(panel.GET, { token: tokens.viewer, params: { id: panelId } })).json;
    expect(history.decisions).toHaveLength(60);

    // One more each: the reviewer approves, the PI approves → approved by both.
    await post(approvals.POST, "reviewer", { id: panelId }, { revisionId: revisionIds[0], decision: "approved" });
    expect(await boardPanel()).toMatchObject({ reviewState: "needs_revision", approvedBy: ["demo-reviewer"], needsRevisionBy: ["demo-pi"] });
    await post(approvals.POST, "pi", { id: panelId }, { revisionId: revisionIds[0], decision: "approved" });
    expect(await boardPanel()).toMatchObject({ reviewState: "approved", approvedBy: ["demo-pi", "demo-reviewer"], needsRevisionBy: [] });
  });

  it("a new revision leaves the old decisions behind: in review again, the reviewer asked anew", async () => {
    await revise("second");
    expect(await boardPanel()).toMatchObject({ reviewState: "in_review", approvedBy: [], needsRevisionBy: [] });
    expect(await queueOf("reviewer")).toEqual(["review"]);
    await post(approvals.POST, "reviewer", { id: panelId }, { revisionId: revisionIds[1], decision: "approved" });
    expect(await boardPanel()).toMatchObject({ reviewState: "approved", approvedBy: ["demo-reviewer"] });
    expect(await queueOf("reviewer")).toEqual([]);
  });

  it("a mention waits in the queue until the person mentioned writes in the thread, and comes back with the next mention", async () => {
    const thread = await post(
      threads.POST,
      "reviewer",
      { id: panelId },
      { body: commentDoc({ mention: "demo-author", label: "Author" }, " is the σ per point?"), revisionId: revisionIds[1] },
    );
    expect(thread.status).toBe(201);
    expect(await queueOf("author")).toEqual(["mention"]);
    expect((await post(reply.POST, "author", { id: thread.json.id }, { body: plainDoc("Yes, per point.") })).status).toBe(201);
    expect(await queueOf("author")).toEqual([]);
    expect(
      (await post(reply.POST, "reviewer", { id: thread.json.id }, { body: commentDoc({ mention: "demo-author", label: "Author" }, " thanks; and the unit?") }))
        .status,
    ).toBe(201);
    expect(await queueOf("author")).toEqual(["mention"]);
  });
});
