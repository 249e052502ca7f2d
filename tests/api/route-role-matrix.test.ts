import { createHash } from "node:crypto";
import { strToU8, zipSync } from "fflate";
import { beforeAll, describe, expect, it } from "vitest";
import { getDb } from "@/db/client";
import { manuscriptMembers, users } from "@/db/schema";
import { DEMO_ACCOUNTS, DEMO_MANUSCRIPT_ID } from "@/lib/demo-data/accounts";
import { API_OPERATIONS } from "@/lib/http/api-catalogue";
import { createApiToken } from "@/lib/server/api-tokens";
import { newId } from "@/lib/server/crypto";
import { call, setupTestApp, uploadForm, type Who } from "./harness";
import { T1_CSV, T1_SPEC } from "./t1-fixture";
import { plainDoc } from "@/lib/review/rich-text";
import { createThread, replyToThread } from "@/lib/server/review/threads";
import { routeFiles } from "./route-files";
import { unsubscribeToken } from "@/lib/server/mail/unsubscribe";
import { signOffFigure } from "@/lib/server/review/decisions";

type Caller = Who | "anonymous";
const CALLERS: Caller[] = ["pi", "author", "reviewer", "viewer", "outsider", "anonymous"];
type Fixture = (who: Caller) => Promise<{ params?: Record<string, string>; body?: unknown; rawBody?: FormData; query?: string }>;

const userOf = (who: Caller) => DEMO_ACCOUNTS.find((a) => a.email.startsWith(`${who}@`))!;

async function freshMember(): Promise<string> {
  const id = newId();
  await getDb()
    .insert(users)
    .values({ id, email: `${id.toLowerCase()}@walk.example.org`, name: "Walk Member" });
  await getDb().insert(manuscriptMembers).values({ manuscriptId: DEMO_MANUSCRIPT_ID, userId: id, role: "viewer" });
  return id;
}

/** A valid request for each operation; a new route fails this test until it is given one. */
const FIXTURES: Record<string, Fixture> = {
  "GET /api/health": async () => ({}),
  "GET /api/openapi.json": async () => ({}),
  "GET /api/ping": async () => ({}),
  // One address per caller: three links per address in 15 minutes is the limit, not what is tested here.
  "POST /api/sign-in-link": async (who) => ({ body: { email: `nobody-${who}@walk.example.org` } }),
  // Each caller turns off their own kind of notice with the token from their mail; the route needs no sign-in.
  "GET /api/unsubscribe": async (who) => ({ query: `token=${unsubscribeToken(userOf(who === "anonymous" ? "viewer" : who).id, ["signed_off"])}` }),
  "POST /api/unsubscribe": async (who) => ({ query: `token=${unsubscribeToken(userOf(who === "anonymous" ? "viewer" : who).id, ["reply"])}` }),
  "GET /api/me": async () => ({}),
  "GET /api/tokens": async () => ({}),
  "POST /api/tokens": async () => ({ body: { name: "walk" } }),
  "DELETE /api/tokens/{id}": async (who) => {
    if (who === "anonymous") return { params: { id: "none" } };
    const a = userOf(who);
    const t = await createApiToken({ id: a.id, email: a.email, name: a.name }, { name: "to revoke" });
    return { params: { id: t.id } };
  },
  "GET /api/manuscripts": async () => ({}),
  "POST /api/manuscripts": async () => ({ body: { title: "Walk", labId: "demo-lab" } }),
  "GET /api/manuscripts/{id}": async () => ({ params: { id: DEMO_MANUSCRIPT_ID } }),
  "GET /api/manuscripts/{id}/members": async () => ({ params: { id: DEMO_MANUSCRIPT_ID } }),
  "POST /api/manuscripts/{id}/members": async () => ({
    params: { id: DEMO_MANUSCRIPT_ID },
    body: { email: `${newId().toLowerCase()}@walk.example.org`, role: "viewer" },
  }),
  "PATCH /api/manuscripts/{id}/members/{userId}": async () => ({ params: { id: DEMO_MANUSCRIPT_ID, userId: await freshMember() }, body: { role: "reviewer" } }),
  "DELETE /api/manuscripts/{id}/members/{userId}": async () => ({ params: { id: DEMO_MANUSCRIPT_ID, userId: await freshMember() } }),
  "GET /api/manuscripts/{id}/datasets": async () => ({ params: { id: DEMO_MANUSCRIPT_ID } }),
  "POST /api/manuscripts/{id}/datasets": async () => ({
    params: { id: DEMO_MANUSCRIPT_ID },
    rawBody: uploadForm(`${newId()}.csv`, `t (µs),s\n1,${Math.random()}\n2,3\n`),
  }),
  "GET /api/datasets/{id}": async () => ({ params: { id: sample.datasetId } }),
  "PATCH /api/datasets/{id}": async () => ({ params: { id: sample.datasetId }, body: { notes: "walked" } }),
  "GET /api/versions/{id}": async () => ({ params: { id: sample.versionId } }),
  "GET /api/versions/{id}/raw": async () => ({ params: { id: sample.versionId } }),
  "GET /api/versions/{id}/rows": async () => ({ params: { id: sample.versionId } }),
  "GET /api/versions/{id}/plot": async () => ({ params: { id: sample.versionId }, query: "x=tau&y=signal" }),
  "GET /api/versions/{id}/analyses": async () => ({ params: { id: sample.fitVersionId } }),
  "GET /api/analysis-models": async () => ({}),
  "POST /api/analyses": async () => ({ body: fitBody() }),
  "POST /api/analyses/preview": async () => ({ body: fitBody() }),
  "POST /api/analyses/bootstrap": async () => ({ body: { ...fitBody(), options: { ...fitBody().options, bootstrap: { draws: 100, seed: 1 } } } }),
  "POST /api/analyses/batch": async () => ({
    body: { manuscriptId: DEMO_MANUSCRIPT_ID, versionIds: [sample.fitVersionId], model: "relaxation", options: { x: "wait", y: "p" } },
  }),
  "POST /api/analyses/global": async () => ({
    body: { manuscriptId: DEMO_MANUSCRIPT_ID, versionIds: await twoT1Versions(), model: "relaxation", shared: ["S0"], options: { x: "wait", y: "p" } },
  }),
  "POST /api/analyses/compare": async () => ({
    body: {
      versionId: sample.fitVersionId,
      options: { x: "wait", y: "p" },
      candidates: [
        { label: "exponential", model: "relaxation" },
        { label: "stretched", model: "relaxation_stretched" },
      ],
    },
  }),
  "POST /api/analyses/scaling": async () => ({ body: { manuscriptId: DEMO_MANUSCRIPT_ID, parameter: "T1", runs: await threeRuns() } }),
  "GET /api/analyses/{id}": async () => ({ params: { id: sample.analysisId } }),
  "GET /api/manuscripts/{id}/statistics": async () => ({ params: { id: DEMO_MANUSCRIPT_ID }, query: "model=relaxation&parameter=T1&groupBy=group" }),
  "GET /api/manuscripts/{id}/house-style": async () => ({ params: { id: DEMO_MANUSCRIPT_ID } }),
  "PUT /api/manuscripts/{id}/house-style": async () => ({
    params: { id: DEMO_MANUSCRIPT_ID },
    body: { font: "Arimo", labelPt: 6, titlePt: 7, axisLinePt: 0.5, dataLinePt: null, letterPt: 8, letterCase: "lower", letterWeight: "bold" },
  }),
  "GET /api/manuscripts/{id}/figures": async () => ({ params: { id: DEMO_MANUSCRIPT_ID } }),
  "POST /api/figures": async () => ({ body: { manuscriptId: DEMO_MANUSCRIPT_ID, title: "Walk" } }),
  "GET /api/figures/{id}": async () => ({ params: { id: sample.figureId } }),
  "PATCH /api/figures/{id}": async () => ({ params: { id: sample.figureId }, body: { widthMm: 120 } }),
  "POST /api/figures/{id}/panels": async () => ({ params: { id: sample.figureId }, body: { title: "walk" } }),
  "POST /api/figures/{id}/order": async () => {
    const fig = (await import("@/app/api/figures/[id]/route")).GET;
    const ids = (await call(fig, { token: tokens.pi, params: { id: sample.figureId } })).json.panels.map((p: any) => p.id).reverse();
    return { params: { id: sample.figureId }, body: { panelIds: ids } };
  },
  "GET /api/panels/{id}": async () => ({ params: { id: sample.panelIds[0]! } }),
  "GET /api/panels/{id}/revisions": async () => ({ params: { id: sample.panelIds[0]! } }),
  "POST /api/panels/{id}/revisions": async () => {
    const panel = (await import("@/app/api/panels/[id]/route")).GET;
    const current = (await call(panel, { token: tokens.pi, params: { id: sample.panelIds[1]! } })).json.currentRevision;
    return {
      params: { id: sample.panelIds[1]! },
      body: { spec: T1_SPEC, bindings: { t1: { versionId: sample.fitVersionId } }, baseRevisionId: current?.id ?? null, message: "walk" },
    };
  },
  "GET /api/revisions/{id}": async () => ({ params: { id: sample.revisionId } }),
  "GET /api/revisions/{id}/data": async () => ({ params: { id: sample.revisionId } }),
  "GET /api/figures/{id}/trace": async () => ({ params: { id: sample.figureId } }),
  "GET /api/figures/{id}/print-check": async () => ({ params: { id: sample.figureId } }),
  "GET /api/figures/{id}/thumbnail": async () => ({ params: { id: sample.figureId } }),
  "GET /api/panels/{id}/thumbnail": async () => ({ params: { id: sample.panelIds[1]! } }),
  "GET /api/figures/{id}/export": async () => ({ params: { id: sample.reviewFigureId }, query: "format=source-data" }),
  "GET /api/panels/{id}/threads": async () => ({ params: { id: sample.reviewPanelId } }),
  "POST /api/panels/{id}/threads": async () => ({
    params: { id: sample.reviewPanelId },
    body: { body: plainDoc("walk"), revisionId: sample.reviewRevisionId },
  }),
  "POST /api/threads/{id}/comments": async () => ({ params: { id: sample.threadId }, body: { body: plainDoc("reply") } }),
  "POST /api/threads/{id}/resolve": async () => ({ params: { id: sample.threadId }, body: { reopen: true } }),
  "POST /api/threads/{id}/follow": async () => ({ params: { id: sample.threadId }, body: { following: true } }),
  "PATCH /api/comments/{id}": async (who) => ({ params: { id: await commentBy(who) }, body: { body: plainDoc("edited") } }),
  "DELETE /api/comments/{id}": async (who) => ({ params: { id: await commentBy(who) } }),
  "POST /api/panels/{id}/approvals": async () => ({
    params: { id: sample.reviewPanelId },
    body: { revisionId: sample.reviewRevisionId, decision: "approved" },
  }),
  "POST /api/figures/{id}/signoff": async () => {
    const f = (await call((await import("@/app/api/figures/[id]/route")).GET, { token: tokens.pi, params: { id: sample.reviewFigureId } })).json;
    return { params: { id: sample.reviewFigureId }, body: { figureHash: f.figureHash, reason: "walk" } };
  },
  "POST /api/figures/{id}/signoff/withdraw": async () => {
    const f = (await call((await import("@/app/api/figures/[id]/route")).GET, { token: tokens.pi, params: { id: sample.reviewFigureId } })).json;
    const s = await signOffFigure(PI, sample.reviewFigureId, { figureHash: f.figureHash, reason: "to withdraw" });
    return { params: { id: sample.reviewFigureId }, body: { signoffId: s.id, reason: "walk" } };
  },
  "POST /api/panels/{id}/send-to-review": async () => ({ params: { id: await draftPanel() } }),
  "POST /api/datasets/{id}/archive": async () => ({ params: { id: sample.datasetId }, body: { archived: false } }),
  "POST /api/analyses/{id}/archive": async () => ({ params: { id: sample.analysisId }, body: { archived: false } }),
  "POST /api/panels/{id}/archive": async () => ({ params: { id: sample.panelIds[1]! }, body: { archived: false } }),
  "POST /api/figures/{id}/archive": async () => ({ params: { id: sample.figureId }, body: { archived: false } }),
  "DELETE /api/datasets/{id}": async () => ({ params: { id: await archivedThing("dataset") } }),
  "DELETE /api/analyses/{id}": async () => ({ params: { id: await archivedThing("analysis") } }),
  "DELETE /api/panels/{id}": async () => ({ params: { id: await archivedThing("panel") } }),
  "DELETE /api/figures/{id}": async () => ({ params: { id: await archivedThing("figure") } }),
  "GET /api/review-queue": async () => ({}),
  "GET /api/manuscripts/{id}/activity": async () => ({ params: { id: DEMO_MANUSCRIPT_ID } }),
  "POST /api/calculators/{id}": async () => ({ params: { id: "odmr-field-from-pair" }, body: { inputs: { f_minus: 2750, f_plus: 2990 } } }),
  // A bundle belongs to no manuscript here: a small crate of one listed file, checked by anyone signed in.
  "POST /api/bundles/verify": async () => ({ rawBody: uploadForm("bundle.zip", tinyCrate()) }),
  // A crate that does not verify: members who may import get as far as the check (422).
  "POST /api/manuscripts/{id}/bundles/import": async () => ({ params: { id: DEMO_MANUSCRIPT_ID }, rawBody: uploadForm("bundle.zip", tinyCrate()) }),
};

/** A zip with ro-crate-metadata.json listing one file by size and sha256 (computed here with node:crypto). */
function tinyCrate(): Uint8Array {
  const note = strToU8("checked from the bundle alone\n");
  const crate = {
    "@context": "https://w3id.org/ro/crate/1.2/context",
    "@graph": [
      { "@id": "ro-crate-metadata.json", "@type": "CreativeWork", about: { "@id": "./" } },
      { "@id": "./", "@type": "Dataset", hasPart: [{ "@id": "note.txt" }] },
      { "@id": "note.txt", "@type": "File", contentSize: String(note.byteLength), sha256: createHash("sha256").update(note).digest("hex") },
    ],
  };
  return zipSync({ "ro-crate-metadata.json": strToU8(JSON.stringify(crate)), "note.txt": note });
}

const PI = { id: "demo-pi", email: "pi@lab.example.org", name: "Mira Halvorsen" };
/** A fresh comment written by the caller when their role may comment (else by the PI), so edits and deletes act on one's own. */
async function commentBy(who: Caller): Promise<string> {
  const a = ["pi", "author", "reviewer"].includes(who) ? userOf(who) : PI;
  const t = await replyToThread({ id: a.id, email: a.email, name: a.name }, sample.threadId, { body: plainDoc(`by ${who}`) });
  return t.comments.at(-1)!.id;
}

/** The sample T1 version and a second upload of the same curve, for the global fit route. */
async function twoT1Versions(): Promise<string[]> {
  const upload = (await import("@/app/api/manuscripts/[id]/datasets/route")).POST;
  const r = await call(upload, { method: "POST", token: tokens.author, params: { id: DEMO_MANUSCRIPT_ID }, rawBody: uploadForm(`t1-${newId()}.csv`, T1_CSV) });
  return [sample.fitVersionId, r.json.id as string];
}

/** A fresh panel with one revision by the author, still a draft. */
/** Three stored runs of the sample fit (the later two on fit windows, so their T1 differ), as points at N = 1, 2, 4 for the scaling route. */
async function threeRuns(): Promise<Array<{ analysisId: string; pulses: number }>> {
  const post = (await import("@/app/api/analyses/route")).POST;
  const windowed = (lo: number) => ({ ...fitBody(), options: { x: "wait", y: "p", xRange: [lo, 1e9] } });
  const more: string[] = [];
  for (const lo of [0.1, 0.2]) more.push((await call(post, { method: "POST", token: tokens.author, body: windowed(lo) })).json.id as string);
  return [sample.analysisId, ...more].map((analysisId, k) => ({ analysisId, pulses: 2 ** k }));
}

async function draftPanel(): Promise<string> {
  const id = (
    await call((await import("@/app/api/figures/[id]/panels/route")).POST, { method: "POST", token: tokens.author, params: { id: sample.figureId }, body: {} })
  ).json.id;
  await call((await import("@/app/api/panels/[id]/revisions/route")).POST, {
    method: "POST",
    token: tokens.author,
    params: { id },
    body: { spec: T1_SPEC, bindings: { t1: { versionId: sample.fitVersionId } }, baseRevisionId: null },
  });
  return id;
}

/** A fresh archived dataset, stored run, panel or figure that nothing references, for the PI to delete for good. */
async function archivedThing(kind: "dataset" | "analysis" | "panel" | "figure"): Promise<string> {
  let id: string;
  if (kind === "dataset") {
    const upload = (await import("@/app/api/manuscripts/[id]/datasets/route")).POST;
    id = (
      await call(upload, {
        method: "POST",
        token: tokens.author,
        params: { id: DEMO_MANUSCRIPT_ID },
        rawBody: uploadForm(`${newId()}.csv`, `t (µs),s\n1,${Math.random()}\n2,3\n`),
      })
    ).json.datasetId;
  } else if (kind === "analysis")
    id = (await call((await import("@/app/api/analyses/route")).POST, { method: "POST", token: tokens.author, body: fitBody() })).json.id;
  else if (kind === "panel")
    id = (
      await call((await import("@/app/api/figures/[id]/panels/route")).POST, {
        method: "POST",
        token: tokens.author,
        params: { id: sample.figureId },
        body: {},
      })
    ).json.id;
  else
    id = (
      await call((await import("@/app/api/figures/route")).POST, {
        method: "POST",
        token: tokens.author,
        body: { manuscriptId: DEMO_MANUSCRIPT_ID, title: "To delete" },
      })
    ).json.id;
  const archive = {
    dataset: (await import("@/app/api/datasets/[id]/archive/route")).POST,
    analysis: (await import("@/app/api/analyses/[id]/archive/route")).POST,
    panel: (await import("@/app/api/panels/[id]/archive/route")).POST,
    figure: (await import("@/app/api/figures/[id]/archive/route")).POST,
  }[kind];
  expect((await call(archive, { method: "POST", token: tokens.author, params: { id }, body: { archived: true } })).status).toBe(200);
  return id;
}

/**
 * The expected status of every route for every caller (demo accounts as in the README), written out
 * by hand from the product's role rules below — not read from lib/authz/policy.ts or the catalogue,
 * so a wrong policy entry, permission or success code fails here.
 *   - anonymous: 401 on every gated route; public routes answer everyone alike (unsubscribing from
 *     mail is public: the signed token in the link names the person).
 *   - outsider (signed in, member of another manuscript only): 404 on anything of the demo manuscript,
 *     including POST /api/analyses, whose manuscript comes from the body; their own things (/api/me,
 *     tokens, queue, models, calculators, checking a bundle) work.
 *   - viewer reads and exports; author also uploads, edits, fits and builds figures; reviewer reads,
 *     exports, comments and decides; PI does everything, and alone manages members and signs off.
 *   - archiving and restoring is for the PI and authors; deleting an archived thing for good, and
 *     withdrawing a sign-off, for the PI alone; sending a draft to review for the PI and authors.
 *   - creating a manuscript needs membership of the lab it is created in (demo-lab): the reviewer
 *     (no lab) and the outsider (another lab) get 404.
 * Success codes are the route's own (201 when something is created).
 */
type Row = readonly [pi: number, author: number, reviewer: number, viewer: number, outsider: number, anonymous: number];
// prettier-ignore
const EXPECTED: Record<string, Row> = {
  //                                                   pi   author reviewer viewer outsider anonymous
  "GET /api/health":                                  [200, 200,   200,     200,   200,     200],
  "GET /api/openapi.json":                            [200, 200,   200,     200,   200,     200],
  "GET /api/ping":                                    [200, 200,   200,     200,   200,     200],
  "POST /api/sign-in-link":                           [202, 202,   202,     202,   202,     202],
  "GET /api/unsubscribe":                             [303, 303,   303,     303,   303,     303],
  "POST /api/unsubscribe":                            [200, 200,   200,     200,   200,     200],
  "GET /api/me":                                      [200, 200,   200,     200,   200,     401],
  "GET /api/tokens":                                  [200, 200,   200,     200,   200,     401],
  "POST /api/tokens":                                 [201, 201,   201,     201,   201,     401],
  "DELETE /api/tokens/{id}":                          [200, 200,   200,     200,   200,     401],
  "GET /api/review-queue":                            [200, 200,   200,     200,   200,     401],
  "GET /api/analysis-models":                         [200, 200,   200,     200,   200,     401],
  "POST /api/calculators/{id}":                       [200, 200,   200,     200,   200,     401],
  "POST /api/bundles/verify":                         [200, 200,   200,     200,   200,     401],
  "POST /api/manuscripts/{id}/bundles/import":        [422, 422,   403,     403,   404,     401],
  "GET /api/manuscripts":                             [200, 200,   200,     200,   200,     401],
  "POST /api/manuscripts":                            [201, 201,   404,     201,   404,     401],
  "GET /api/manuscripts/{id}":                        [200, 200,   200,     200,   404,     401],
  "GET /api/manuscripts/{id}/members":                [200, 200,   200,     200,   404,     401],
  "POST /api/manuscripts/{id}/members":               [201, 403,   403,     403,   404,     401],
  "PATCH /api/manuscripts/{id}/members/{userId}":     [200, 403,   403,     403,   404,     401],
  "DELETE /api/manuscripts/{id}/members/{userId}":    [200, 403,   403,     403,   404,     401],
  "GET /api/manuscripts/{id}/activity":               [200, 200,   200,     200,   404,     401],
  "GET /api/manuscripts/{id}/datasets":               [200, 200,   200,     200,   404,     401],
  "POST /api/manuscripts/{id}/datasets":              [201, 201,   403,     403,   404,     401],
  "GET /api/datasets/{id}":                           [200, 200,   200,     200,   404,     401],
  "PATCH /api/datasets/{id}":                         [200, 200,   403,     403,   404,     401],
  "GET /api/versions/{id}":                           [200, 200,   200,     200,   404,     401],
  "GET /api/versions/{id}/raw":                       [200, 200,   200,     200,   404,     401],
  "GET /api/versions/{id}/rows":                      [200, 200,   200,     200,   404,     401],
  "GET /api/versions/{id}/plot":                      [200, 200,   200,     200,   404,     401],
  "GET /api/versions/{id}/analyses":                  [200, 200,   200,     200,   404,     401],
  "POST /api/analyses":                               [201, 201,   403,     403,   404,     401],
  "POST /api/analyses/preview":                       [200, 200,   403,     403,   404,     401],
  "POST /api/analyses/bootstrap":                     [200, 200,   403,     403,   404,     401],
  "POST /api/analyses/batch":                         [200, 200,   403,     403,   404,     401],
  "POST /api/analyses/global":                        [200, 200,   403,     403,   404,     401],
  "POST /api/analyses/compare":                       [200, 200,   403,     403,   404,     401],
  "POST /api/analyses/scaling":                       [200, 200,   403,     403,   404,     401],
  "GET /api/analyses/{id}":                           [200, 200,   200,     200,   404,     401],
  "GET /api/manuscripts/{id}/statistics":             [200, 200,   200,     200,   404,     401],
  "GET /api/manuscripts/{id}/house-style":            [200, 200,   200,     200,   404,     401],
  "PUT /api/manuscripts/{id}/house-style":            [200, 200,   403,     403,   404,     401],
  "GET /api/manuscripts/{id}/figures":                [200, 200,   200,     200,   404,     401],
  "POST /api/figures":                                [201, 201,   403,     403,   404,     401],
  "GET /api/figures/{id}":                            [200, 200,   200,     200,   404,     401],
  "PATCH /api/figures/{id}":                          [200, 200,   403,     403,   404,     401],
  "POST /api/figures/{id}/panels":                    [201, 201,   403,     403,   404,     401],
  "POST /api/figures/{id}/order":                     [200, 200,   403,     403,   404,     401],
  "GET /api/figures/{id}/trace":                      [200, 200,   200,     200,   404,     401],
  "GET /api/figures/{id}/print-check":                [200, 200,   200,     200,   404,     401],
  "GET /api/figures/{id}/thumbnail":                  [200, 200,   200,     200,   404,     401],
  "GET /api/panels/{id}/thumbnail":                   [200, 200,   200,     200,   404,     401],
  "GET /api/figures/{id}/export":                     [200, 200,   200,     200,   404,     401],
  "GET /api/panels/{id}":                             [200, 200,   200,     200,   404,     401],
  "GET /api/panels/{id}/revisions":                   [200, 200,   200,     200,   404,     401],
  "POST /api/panels/{id}/revisions":                  [201, 201,   403,     403,   404,     401],
  "GET /api/revisions/{id}":                          [200, 200,   200,     200,   404,     401],
  "GET /api/revisions/{id}/data":                     [200, 200,   200,     200,   404,     401],
  "GET /api/panels/{id}/threads":                     [200, 200,   200,     200,   404,     401],
  "POST /api/panels/{id}/threads":                    [201, 201,   201,     403,   404,     401],
  "POST /api/threads/{id}/comments":                  [201, 201,   201,     403,   404,     401],
  "POST /api/threads/{id}/resolve":                   [200, 200,   200,     403,   404,     401],
  "POST /api/threads/{id}/follow":                    [200, 200,   200,     200,   404,     401],
  "PATCH /api/comments/{id}":                         [200, 200,   200,     403,   404,     401],
  "DELETE /api/comments/{id}":                        [200, 200,   200,     403,   404,     401],
  "POST /api/panels/{id}/approvals":                  [201, 201,   201,     403,   404,     401],
  "POST /api/figures/{id}/signoff":                   [201, 403,   403,     403,   404,     401],
  "POST /api/figures/{id}/signoff/withdraw":          [200, 403,   403,     403,   404,     401],
  "POST /api/panels/{id}/send-to-review":             [200, 200,   403,     403,   404,     401],
  "POST /api/datasets/{id}/archive":                  [200, 200,   403,     403,   404,     401],
  "POST /api/analyses/{id}/archive":                  [200, 200,   403,     403,   404,     401],
  "POST /api/panels/{id}/archive":                    [200, 200,   403,     403,   404,     401],
  "POST /api/figures/{id}/archive":                   [200, 200,   403,     403,   404,     401],
  "DELETE /api/datasets/{id}":                        [200, 403,   403,     403,   404,     401],
  "DELETE /api/analyses/{id}":                        [200, 403,   403,     403,   404,     401],
  "DELETE /api/panels/{id}":                          [200, 403,   403,     403,   404,     401],
  "DELETE /api/figures/{id}":                         [200, 403,   403,     403,   404,     401],
};

let tokens: Record<Who, string>;
const sample = {
  datasetId: "",
  versionId: "",
  fitVersionId: "",
  analysisId: "",
  figureId: "",
  panelIds: [] as string[],
  revisionId: "",
  reviewPanelId: "",
  reviewRevisionId: "",
  reviewFigureId: "",
  threadId: "",
};
const fitBody = () => ({ versionId: sample.fitVersionId, model: "relaxation", options: { x: "wait", y: "p" } });
beforeAll(async () => {
  ({ tokens } = await setupTestApp());
  const upload = (await import("@/app/api/manuscripts/[id]/datasets/route")).POST;
  const r = await call(upload, {
    method: "POST",
    token: tokens.author,
    params: { id: DEMO_MANUSCRIPT_ID },
    rawBody: uploadForm("echo.csv", "tau (µs),signal\n1,0.9\n2,0.8\n4,0.6\n"),
  });
  Object.assign(sample, { datasetId: r.json.datasetId, versionId: r.json.id });
  const t1 = await call(upload, {
    method: "POST",
    token: tokens.author,
    params: { id: DEMO_MANUSCRIPT_ID },
    rawBody: uploadForm("t1.csv", T1_CSV, { metadata: JSON.stringify({ kind: "relaxation", tags: { group: "a" } }) }),
  });
  sample.fitVersionId = t1.json.id;
  const run = await call((await import("@/app/api/analyses/route")).POST, { method: "POST", token: tokens.author, body: fitBody() });
  sample.analysisId = run.json.id;
  const fig = await call((await import("@/app/api/figures/route")).POST, {
    method: "POST",
    token: tokens.author,
    body: { manuscriptId: DEMO_MANUSCRIPT_ID, title: "Coherence" },
  });
  sample.figureId = fig.json.id;
  const addPanel = (await import("@/app/api/figures/[id]/panels/route")).POST;
  for (let i = 0; i < 2; i++)
    sample.panelIds.push((await call(addPanel, { method: "POST", token: tokens.author, params: { id: sample.figureId }, body: {} })).json.id);
  const revise = (await import("@/app/api/panels/[id]/revisions/route")).POST;
  const rev = await call(revise, {
    method: "POST",
    token: tokens.author,
    params: { id: sample.panelIds[0]! },
    body: { spec: T1_SPEC, bindings: { t1: { versionId: sample.fitVersionId } }, baseRevisionId: null },
  });
  sample.revisionId = rev.json.id;
  // A panel whose revision none of the walking callers made, so every allowed role may decide on it.
  const walker = { id: "walk-author", email: "walk-author@lab.example.org", name: "Walk Author" };
  await getDb().insert(users).values(walker);
  await getDb().insert(manuscriptMembers).values({ manuscriptId: DEMO_MANUSCRIPT_ID, userId: walker.id, role: "author" });
  const walkerToken = (await createApiToken(walker, { name: "walk" })).token;
  const fig2 = await call((await import("@/app/api/figures/route")).POST, {
    method: "POST",
    token: walkerToken,
    body: { manuscriptId: DEMO_MANUSCRIPT_ID, title: "Review walk" },
  });
  sample.reviewFigureId = fig2.json.id;
  sample.reviewPanelId = (await call(addPanel, { method: "POST", token: walkerToken, params: { id: fig2.json.id }, body: {} })).json.id;
  sample.reviewRevisionId = (
    await call(revise, {
      method: "POST",
      token: walkerToken,
      params: { id: sample.reviewPanelId },
      body: { spec: T1_SPEC, bindings: { t1: { versionId: sample.fitVersionId } }, baseRevisionId: null },
    })
  ).json.id;
  await call((await import("@/app/api/panels/[id]/send-to-review/route")).POST, { method: "POST", token: walkerToken, params: { id: sample.reviewPanelId } });
  sample.threadId = (await createThread(PI, sample.reviewPanelId, { body: plainDoc("Is the baseline flat?"), revisionId: sample.reviewRevisionId })).id;
});

describe("every route × every role", () => {
  const files = routeFiles();
  const catalogued = API_OPERATIONS.map((o) => `${o.method} ${o.path}`);

  it("the table has one row for every catalogued route, and no row for a route that is gone", () => {
    expect(Object.keys(EXPECTED).sort()).toEqual([...catalogued].sort());
  });

  for (const op of API_OPERATIONS) {
    const key = `${op.method} ${op.path}`;
    it(key, async () => {
      const fixture = FIXTURES[key];
      const row = EXPECTED[key];
      expect(fixture, `add a fixture for ${key}`).toBeTruthy();
      expect(row, `add a row for ${key} to EXPECTED`).toBeTruthy();
      const file = files.find((f) => f.apiPath === op.path)!.file;
      const handler = (await import(file))[op.method];
      for (const [i, who] of CALLERS.entries()) {
        const { params, body, rawBody, query } = await fixture!(who);
        const path = `${op.path}${query ? `?${query}` : ""}`;
        const r = await call(handler, { method: op.method, path, token: who === "anonymous" ? null : tokens[who], params, body, rawBody });
        expect(r.status, `${key} as ${who}: ${JSON.stringify(r.json)}`).toBe(row![i]);
      }
    });
  }
});
