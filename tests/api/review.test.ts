import { beforeAll, describe, expect, it } from "vitest";
import { eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { comments, notices } from "@/db/schema";
import { DEMO_MANUSCRIPT_ID } from "@/lib/demo-data/accounts";
import { plainDoc } from "@/lib/review/rich-text";
import { verifyAuditChain } from "@/lib/server/audit";
import * as upload from "@/app/api/manuscripts/[id]/datasets/route";
import * as figuresRoute from "@/app/api/figures/route";
import * as figure from "@/app/api/figures/[id]/route";
import * as panelsRoute from "@/app/api/figures/[id]/panels/route";
import * as panel from "@/app/api/panels/[id]/route";
import * as revisions from "@/app/api/panels/[id]/revisions/route";
import * as threads from "@/app/api/panels/[id]/threads/route";
import * as reply from "@/app/api/threads/[id]/comments/route";
import * as resolve from "@/app/api/threads/[id]/resolve/route";
import * as comment from "@/app/api/comments/[id]/route";
import * as approvals from "@/app/api/panels/[id]/approvals/route";
import * as signoff from "@/app/api/figures/[id]/signoff/route";
import * as queue from "@/app/api/review-queue/route";
import * as sendToReview from "@/app/api/panels/[id]/send-to-review/route";
import * as activity from "@/app/api/manuscripts/[id]/activity/route";
import * as manuscript from "@/app/api/manuscripts/[id]/route";
import { call, setupTestApp, uploadForm, type Who } from "./harness";

let tokens: Record<Who, string>;
const SPEC = {
  $schema: "https://vega.github.io/schema/vega-lite/v6.json",
  data: { name: "echo" },
  mark: "point",
  // Titled with units, so the print check lets the PI sign off a clean figure without a reason.
  encoding: { x: { field: "tau", type: "quantitative", title: "τ (µs)" }, y: { field: "signal", type: "quantitative", title: "signal (norm.)" } },
};
const post = (h: any, who: Who, params: Record<string, string>, body: unknown) => call(h, { method: "POST", token: tokens[who], params, body });

let v1: any, figureId: string, panelId: string, rev1: any, flatThreadId: string;
beforeAll(async () => {
  ({ tokens } = await setupTestApp());
  v1 = (
    await call(upload.POST, {
      method: "POST",
      token: tokens.author,
      params: { id: DEMO_MANUSCRIPT_ID },
      rawBody: uploadForm("echo.csv", "tau (µs),signal\n1,0.9\n2,0.8\n"),
    })
  ).json;
  figureId = (await post(figuresRoute.POST, "author", {}, { manuscriptId: DEMO_MANUSCRIPT_ID, title: "Coherence" })).json.id;
  await call(figure.PATCH, { method: "PATCH", token: tokens.pi, params: { id: figureId }, body: { requiredReviewers: ["demo-reviewer"] } });
  panelId = (await post(panelsRoute.POST, "author", { id: figureId }, {})).json.id;
  rev1 = (
    await post(revisions.POST, "author", { id: panelId }, { spec: SPEC, bindings: { echo: { versionId: v1.id } }, baseRevisionId: null, message: "first" })
  ).json;
});

describe("the review journey", () => {
  it("a new panel is a draft: nobody is asked, comments are welcome, decisions wait until its author sends it to review", async () => {
    expect((await call(panel.GET, { token: tokens.reviewer, params: { id: panelId } })).json).toMatchObject({ reviewState: "draft", inReview: false });
    const waiting = (await call(queue.GET, { token: tokens.reviewer })).json.items.filter((i: any) => i.panelId === panelId);
    expect(waiting).toEqual([]);
    const early = await post(approvals.POST, "reviewer", { id: panelId }, { revisionId: rev1.id, decision: "approved" });
    expect(early.status).toBe(409);
    expect(early.json.error.message).toBe(
      "This panel is a draft: comment on it freely, but approvals and requests for a revision wait until its author sends it to review.",
    );
    expect((await post(sendToReview.POST, "reviewer", { id: panelId }, undefined)).status).toBe(403);
    const sent = await post(sendToReview.POST, "author", { id: panelId }, undefined);
    expect(sent.status).toBe(200);
    expect((await post(sendToReview.POST, "author", { id: panelId }, undefined)).json.error.message).toBe("This panel is already in review.");
    expect((await call(panel.GET, { token: tokens.reviewer, params: { id: panelId } })).json).toMatchObject({ reviewState: "in_review", inReview: true });
    const asked = (await call(queue.GET, { token: tokens.reviewer })).json.items.filter((i: any) => i.panelId === panelId);
    expect(asked.map((i: any) => i.what)).toEqual(["review panel a (revision 1)"]);
  });

  it("reviewer comments on an x-range and approves; author's own approval is refused", async () => {
    const t = await post(
      threads.POST,
      "reviewer",
      { id: panelId },
      { body: plainDoc("The tail above 1 ms looks flat — enough points?"), revisionId: rev1.id, anchor: { type: "xrange", x0: 1, x1: 2 } },
    );
    expect(t.status).toBe(201);
    flatThreadId = t.json.id;
    expect(t.json).toMatchObject({ anchor: { type: "xrange", x0: 1, x1: 2 }, revisionNumber: 1, status: "open" });
    expect((await post(approvals.POST, "author", { id: panelId }, { revisionId: rev1.id, decision: "approved" })).status).toBe(403);
    expect((await post(approvals.POST, "viewer", { id: panelId }, { revisionId: rev1.id, decision: "approved" })).status).toBe(403);
    const a = await post(approvals.POST, "reviewer", { id: panelId }, { revisionId: rev1.id, decision: "approved", note: "fine" });
    expect(a.status).toBe(201);
    const p = await call(panel.GET, { token: tokens.viewer, params: { id: panelId } });
    expect(p.json).toMatchObject({ reviewState: "approved", approvedBy: ["demo-reviewer"] });
    expect(p.json.decisions[0]).toMatchObject({ decision: "approved", userId: "demo-reviewer", contentHash: rev1.contentHash, stale: false });
  });

  it("a new data version rebound shows the approval as stale, with what changed", async () => {
    const v2 = (
      await call(upload.POST, {
        method: "POST",
        token: tokens.author,
        params: { id: DEMO_MANUSCRIPT_ID },
        rawBody: uploadForm("echo.csv", "tau (µs),signal\n1,0.91\n2,0.79\n", { datasetId: v1.datasetId }),
      })
    ).json;
    const rev2 = (
      await post(
        revisions.POST,
        "author",
        { id: panelId },
        { spec: SPEC, bindings: { echo: { versionId: v2.id } }, baseRevisionId: rev1.id, message: "rebind to v2" },
      )
    ).json;
    const p = (await call(panel.GET, { token: tokens.reviewer, params: { id: panelId } })).json;
    expect(p.reviewState).toBe("in_review");
    expect(p.decisions[0]).toMatchObject({ stale: true, contentHash: rev1.contentHash });
    expect(p.decisions[0].changes).toEqual([expect.objectContaining({ kind: "data", name: "echo", text: 'data "echo": version 1 → 2' })]);
    const late = await post(approvals.POST, "reviewer", { id: panelId }, { revisionId: rev1.id, decision: "approved" });
    expect(late.status).toBe(409);
    expect((await post(approvals.POST, "reviewer", { id: panelId }, { revisionId: rev2.id, decision: "approved" })).status).toBe(201);
    expect((await call(panel.GET, { token: tokens.reviewer, params: { id: panelId } })).json.reviewState).toBe("approved");
  });

  it("the queue shows the PI a pending sign-off; the PI signs the current hash only", async () => {
    const items = (await call(queue.GET, { token: tokens.pi })).json.items;
    expect(items).toEqual(expect.arrayContaining([expect.objectContaining({ kind: "signoff", figureId })]));
    const f = (await call(figure.GET, { token: tokens.pi, params: { id: figureId } })).json;
    expect(f.reviewState).toBe("approved");
    expect((await post(signoff.POST, "author", { id: figureId }, { figureHash: f.figureHash })).status).toBe(403);
    expect((await post(signoff.POST, "pi", { id: figureId }, { figureHash: "0".repeat(64) })).status).toBe(409);
    // Every panel is approved, but the reviewer's thread is still open: that is an open issue, listed with its words.
    const asked = await post(signoff.POST, "pi", { id: figureId }, { figureHash: f.figureHash });
    expect(asked.status).toBe(400);
    expect(asked.json.error.details.open).toEqual(["panel a has an open thread: “The tail above 1 ms looks flat — enough points?”"]);
    expect(asked.json.error.details.issues).toEqual([
      { panelId, letter: "a", state: "approved", threads: [{ id: flatThreadId, excerpt: "The tail above 1 ms looks flat — enough points?" }] },
    ]);
    expect((await post(resolve.POST, "reviewer", { id: flatThreadId }, {})).status).toBe(200);
    const s = await post(signoff.POST, "pi", { id: figureId }, { figureHash: f.figureHash });
    expect(s.status).toBe(201);
    const m = (await call(manuscript.GET, { token: tokens.viewer, params: { id: DEMO_MANUSCRIPT_ID } })).json;
    expect(m.figures.find((x: any) => x.id === figureId)).toMatchObject({ reviewState: "signed_off" });
  });

  it("signing off with open issues needs a recorded reason", async () => {
    const fid = (await post(figuresRoute.POST, "author", {}, { manuscriptId: DEMO_MANUSCRIPT_ID, title: "Spectra" })).json.id;
    const pid = (await post(panelsRoute.POST, "author", { id: fid }, {})).json.id;
    const r = (await post(revisions.POST, "author", { id: pid }, { spec: SPEC, bindings: { echo: { versionId: v1.id } }, baseRevisionId: null })).json;
    const draft = await post(
      signoff.POST,
      "pi",
      { id: fid },
      { figureHash: (await call(figure.GET, { token: tokens.pi, params: { id: fid } })).json.figureHash },
    );
    expect(draft.json.error.details.open).toEqual(["panel a is draft"]);
    await post(sendToReview.POST, "author", { id: pid }, undefined);
    await post(approvals.POST, "reviewer", { id: pid }, { revisionId: r.id, decision: "needs_revision", note: "axis title lacks units" });
    const f = (await call(figure.GET, { token: tokens.pi, params: { id: fid } })).json;
    expect(f.reviewState).toBe("needs_revision");
    const bare = await post(signoff.POST, "pi", { id: fid }, { figureHash: f.figureHash });
    expect(bare.status).toBe(400);
    expect(bare.json.error.message).toMatch(/^reason: open issues \(panel a is needs revision\)/);
    expect((await post(signoff.POST, "pi", { id: fid }, { figureHash: f.figureHash, reason: "units fixed in caption" })).status).toBe(201);
    const told = await getDb().select().from(notices).where(eq(notices.kind, "needs_revision"));
    expect(told.map((x) => x.userId)).toContain("demo-author");
  });
});

describe("comments", () => {
  it("stores hostile markup inert and refuses javascript: links", async () => {
    const t = await post(
      threads.POST,
      "reviewer",
      { id: panelId },
      { body: plainDoc("<img src=x onerror=alert(1)><svg onload=alert(2)>"), revisionId: rev1.id },
    );
    expect(t.json.comments[0].html).toBe("<p>&lt;img src=x onerror=alert(1)&gt;&lt;svg onload=alert(2)&gt;</p>");
    const js = await post(
      threads.POST,
      "reviewer",
      { id: panelId },
      {
        body: {
          type: "doc",
          content: [{ type: "paragraph", content: [{ type: "text", text: "x", marks: [{ type: "link", attrs: { href: "javascript:alert(1)" } }] }] }],
        },
        revisionId: rev1.id,
      },
    );
    expect(js.status).toBe(400);
    expect(js.json.error.message).toMatch(/body.content\[0\].content\[0\].marks\[0\]: links must start with/);
  });

  it("mentions mail the member; strangers cannot be mentioned", async () => {
    const body = {
      type: "doc",
      content: [
        {
          type: "paragraph",
          content: [
            { type: "text", text: "ping " },
            { type: "mention", attrs: { id: "demo-author", label: "Tomás" } },
          ],
        },
      ],
    };
    const t = await post(threads.POST, "reviewer", { id: panelId }, { body, revisionId: rev1.id });
    expect(t.status).toBe(201);
    const told = await getDb().select().from(notices).where(eq(notices.kind, "mention"));
    expect(told.map((m) => m.userId)).toContain("demo-author");
    const q = (await call(queue.GET, { token: tokens.author })).json.items;
    expect(q).toEqual(expect.arrayContaining([expect.objectContaining({ kind: "mention", panelId })]));
    const stranger = await post(
      threads.POST,
      "reviewer",
      { id: panelId },
      { body: { ...body, content: [{ type: "paragraph", content: [{ type: "mention", attrs: { id: "demo-outsider" } }] }] }, revisionId: rev1.id },
    );
    expect(stranger.status).toBe(400);
  });

  it("replies, resolves, edits with history, deletes only while nobody replied; retries are idempotent", async () => {
    const t = (await post(threads.POST, "reviewer", { id: panelId }, { body: plainDoc("first"), revisionId: rev1.id, clientKey: "k1" })).json;
    const again = (await post(threads.POST, "reviewer", { id: panelId }, { body: plainDoc("first"), revisionId: rev1.id, clientKey: "k1" })).json;
    expect(again.id).toBe(t.id);
    const r = await post(reply.POST, "author", { id: t.id }, { body: plainDoc("will add points"), clientKey: "k2" });
    expect(r.json.comments).toHaveLength(2);
    await post(reply.POST, "author", { id: t.id }, { body: plainDoc("will add points"), clientKey: "k2" });
    expect((await getDb().select().from(comments).where(eq(comments.threadId, t.id))).length).toBe(2);
    const first = t.comments[0].id;
    expect((await call(comment.DELETE, { method: "DELETE", token: tokens.reviewer, params: { id: first } })).status).toBe(409);
    expect((await call(comment.PATCH, { method: "PATCH", token: tokens.author, params: { id: first }, body: { body: plainDoc("x") } })).status).toBe(403);
    const edited = await call(comment.PATCH, { method: "PATCH", token: tokens.reviewer, params: { id: first }, body: { body: plainDoc("first, edited") } });
    expect(edited.json.comments[0].html).toBe("<p>first, edited</p>");
    expect(edited.json.comments[0].editedAt).toBeTruthy();
    const last = r.json.comments[1].id;
    expect((await call(comment.DELETE, { method: "DELETE", token: tokens.author, params: { id: last } })).status).toBe(200);
    expect((await post(resolve.POST, "reviewer", { id: t.id }, {})).json.status).toBe("resolved");
    expect((await post(resolve.POST, "viewer", { id: t.id }, { reopen: true })).status).toBe(403);
  });

  it("with Prefer: return=minimal a reply answers only the new comment, and a retry the same one", async () => {
    const t = (await post(threads.POST, "reviewer", { id: panelId }, { body: plainDoc("opening"), revisionId: rev1.id })).json;
    const ask = (clientKey: string) =>
      call(reply.POST, {
        method: "POST",
        token: tokens.author,
        params: { id: t.id },
        headers: { prefer: "return=minimal" },
        body: { body: plainDoc("a <b>short</b> answer"), clientKey },
      });
    const r = await ask("minimal-1");
    expect(r.status).toBe(201);
    expect(r.headers.get("preference-applied")).toBe("return=minimal");
    expect(r.json).toMatchObject({
      threadId: t.id,
      createdBy: "demo-author",
      authorName: "Tomás Ekberg",
      html: "<p>a &lt;b&gt;short&lt;/b&gt; answer</p>",
      editedAt: null,
    });
    expect(r.json.comments).toBeUndefined();
    const retry = await ask("minimal-1");
    expect(retry.json.id).toBe(r.json.id);
    const listed = (await call(threads.GET, { token: tokens.viewer, params: { id: panelId } })).json.items.find((x: any) => x.id === t.id);
    expect(listed.comments.map((c: any) => c.id)).toEqual([t.comments[0].id, r.json.id]);
    expect(listed.comments[1].createdAt).toBe(r.json.createdAt);
    const whole = await post(reply.POST, "author", { id: t.id }, { body: plainDoc("and the whole thread back") });
    expect(whole.headers.get("preference-applied")).toBeNull();
    expect(whole.json.comments).toHaveLength(3);
  });

  it("the activity log tells the story and its hash chain holds", async () => {
    const items = (await call(activity.GET, { token: tokens.viewer, params: { id: DEMO_MANUSCRIPT_ID } })).json.items;
    const texts = items.map((i: any) => `${i.actor} ${i.text}`);
    expect(texts).toEqual(
      expect.arrayContaining([
        expect.stringMatching(/^Ines Varga approved a panel/),
        expect.stringMatching(/^Mira Halvorsen signed off a figure/),
        expect.stringMatching(/saved revision 2 — “rebind to v2”/),
      ]),
    );
    expect(await verifyAuditChain(getDb())).toMatchObject({ ok: true });
  });
});
