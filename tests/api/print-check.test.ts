// GET /api/figures/{id}/print-check on figures built as the builder builds them, and the sign-off it gates:
// a figure like the demo's echo panel passes every rule and signs off cleanly; the same panel with a 4 pt
// label fails the text rule, and the PI can then sign off only with a reason, recorded with the failures
// in the audit log and the trace.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { and, eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { auditLog } from "@/db/schema";
import { DEMO_MANUSCRIPT_ID } from "@/lib/demo-data/accounts";
import { hahnEchoFiles } from "@/lib/demo-data/hahn-echo";
import { getTemplate } from "@/lib/figures/templates";
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
import * as printCheck from "@/app/api/figures/[id]/print-check/route";
import * as traceRoute from "@/app/api/figures/[id]/trace/route";
import { call, setupTestApp, uploadForm, type Who } from "./harness";

let tokens: Record<Who, string>;
const post = (h: any, who: Who, params: Record<string, string>, body?: unknown) => call(h, { method: "POST", token: tokens[who], params, body });
let versionId: string;
let analysisId: string;

/** The demo's echo panel as the decay-curve template builds it: points ± σ, the stored fit, a residual strip, log τ. */
function echoSpec() {
  const options = {
    dataName: "echo",
    xField: "tau",
    yField: "signal",
    sigmaField: "sigma",
    fitName: "fit",
    residualName: "",
    xScale: "log",
    print: { widthMm: 183, heightMm: 55 },
  };
  return getTemplate("decay-curve")!.build(options as never) as unknown as { layer: unknown[] };
}

/** A figure with one full-width panel, sent to review and approved, so the print check alone decides the sign-off. */
async function approvedFigure(title: string, spec: unknown, message: string) {
  const figureId = (await post(figuresRoute.POST, "author", {}, { manuscriptId: DEMO_MANUSCRIPT_ID, title, widthMm: 183, columns: 2 })).json.id;
  const panelId = (await post(panelsRoute.POST, "author", { id: figureId }, { colSpan: 2 })).json.id;
  const bindings = { echo: { versionId }, fit: { analysisId, output: "curve" } };
  const rev = await post(revisions.POST, "author", { id: panelId }, { baseRevisionId: null, spec, bindings, message });
  expect(rev.status).toBe(201);
  await post(sendToReview.POST, "author", { id: panelId });
  expect((await post(approvals.POST, "reviewer", { id: panelId }, { revisionId: rev.json.id, decision: "approved" })).status).toBe(201);
  return figureId;
}

const check = (id: string) => call(printCheck.GET, { token: tokens.viewer, params: { id } });
const figureHash = async (id: string) => (await call(figureRoute.GET, { token: tokens.pi, params: { id } })).json.figureHash as string;

beforeAll(async () => {
  ({ tokens } = await setupTestApp());
  const echo = hahnEchoFiles()[0]!;
  versionId = (
    await call(upload.POST, { method: "POST", token: tokens.author, params: { id: DEMO_MANUSCRIPT_ID }, rawBody: uploadForm(echo.fileName, echo.content) })
  ).json.id;
  analysisId = (await post(analyses.POST, "author", {}, { versionId, model: "hahn_echo", options: { x: "tau", y: "signal", sigma: "sigma" } })).json.id;
}, 120_000);
afterAll(async () => {
  await stopRenderWorkers();
});

describe("the print check of a figure", () => {
  it("a demo-like figure passes every rule, and the PI signs it off without a reason", async () => {
    const id = await approvedFigure("Coherence", echoSpec(), "Echo of NV09 with the stored stretched-exponential fit");
    const r = await check(id);
    expect(r.status).toBe(200);
    expect(r.json.figureHash).toBe(await figureHash(id));
    expect(r.json.items.map((i: any) => [i.id, i.ok, i.problems])).toEqual([
      ["text-size", true, []],
      ["figure-size", true, []],
      ["axis-units", true, []],
      ["colour-pairs", true, []],
      ["error-bars", true, []], // the file's header: "# sigma: standard error of the mean over 20 blocks"
      ["group-n", true, []],
      ["raster-dpi", true, []],
      ["latest-data", true, []],
    ]);
    expect(r.json.ok).toBe(true);
    expect(r.json.items.find((i: any) => i.id === "text-size").detail).toBe("smallest text 7.0 pt");
    expect(r.json.items.find((i: any) => i.id === "raster-dpi").detail).toBe("the PNG and TIFF exports offer 300, 600, 1200 dpi only");
    const s = await post(signoff.POST, "pi", { id }, { figureHash: await figureHash(id) });
    expect(s.status).toBe(201);
    expect(s.json.printCheck).toEqual([]);
  });

  it("a 4 pt label fails the text rule; signing off then needs a reason, which is recorded with the failures", async () => {
    const spec = echoSpec();
    spec.layer.push({
      data: { name: "echo" },
      mark: { type: "text", fontSize: 4, align: "left" },
      encoding: { x: { datum: 2, type: "quantitative" }, y: { datum: 0.5, type: "quantitative" }, text: { value: "stretched exponential" } },
    });
    const id = await approvedFigure("Coherence, annotated", spec, "Echo of NV09 with a note on the fit");
    const r = await check(id);
    expect(r.json.ok).toBe(false);
    const text = r.json.items.find((i: any) => i.id === "text-size");
    // The label is drawn once per row of the bound data (80 τ values): one line says so.
    expect(text).toMatchObject({ ok: false, problems: ["“stretched exponential” in panel a prints at 4.0 pt (80 times)"] });
    expect(r.json.items.filter((i: any) => !i.ok).map((i: any) => i.id)).toEqual(["text-size"]);

    const hash = await figureHash(id);
    const bare = await post(signoff.POST, "pi", { id }, { figureHash: hash });
    expect(bare.status).toBe(400);
    const line = "Every text at least 5 pt at 183 mm wide: “stretched exponential” in panel a prints at 4.0 pt (80 times)";
    expect(bare.json.error.message).toBe(`reason: print check failures (${line}); signing off anyway needs a recorded reason.`);
    expect(bare.json.error.details).toMatchObject({ open: [], issues: [], printCheck: [line] });

    const reason = "The note is a 4 pt superscript in the journal's own style; the editor agreed.";
    const s = await post(signoff.POST, "pi", { id }, { figureHash: hash, reason });
    expect(s.status).toBe(201);
    const [entry] = await getDb()
      .select()
      .from(auditLog)
      .where(and(eq(auditLog.action, "figure.signoff"), eq(auditLog.target, `figure:${id}`)));
    expect(JSON.parse(String(entry!.data))).toMatchObject({ signoffId: s.json.id, reason, printCheck: [line] });
    const trace = (await call(traceRoute.GET, { token: tokens.viewer, params: { id } })).json;
    expect(trace.signoffs).toEqual([expect.objectContaining({ id: s.json.id, reason, printCheck: [line] })]);
  });

  it("a figure that cannot be drawn yet answers with the reason instead of an error", async () => {
    const id = (await post(figuresRoute.POST, "author", {}, { manuscriptId: DEMO_MANUSCRIPT_ID, title: "Empty" })).json.id;
    await post(panelsRoute.POST, "author", { id }, {});
    const r = await check(id);
    expect(r.status).toBe(200);
    expect(r.json.items.find((i: any) => i.id === "text-size")).toMatchObject({
      ok: false,
      problems: ["panel a has no revision yet, so the figure cannot be drawn"],
    });
  });
});
