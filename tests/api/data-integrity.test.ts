import { and, eq } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import { getDb } from "@/db/client";
import { auditLog, panels, revisions as revisionsTable } from "@/db/schema";
import { DEMO_MANUSCRIPT_ID } from "@/lib/demo-data/accounts";
import { hahnEchoFiles } from "@/lib/demo-data/hahn-echo";
import { canonicalJson } from "@/lib/figures/canonical-spec";
import { resolveBindings, revisionContentHash } from "@/lib/server/figures/bindings";
import * as upload from "@/app/api/manuscripts/[id]/datasets/route";
import * as manuscript from "@/app/api/manuscripts/[id]/route";
import * as analyses from "@/app/api/analyses/route";
import * as figuresRoute from "@/app/api/figures/route";
import * as figure from "@/app/api/figures/[id]/route";
import * as panelsRoute from "@/app/api/figures/[id]/panels/route";
import * as panel from "@/app/api/panels/[id]/route";
import * as revisions from "@/app/api/panels/[id]/revisions/route";
import * as approvals from "@/app/api/panels/[id]/approvals/route";
import * as revisionData from "@/app/api/revisions/[id]/data/route";
import { call, setupTestApp, uploadForm, type Who } from "./harness";

let tokens: Record<Who, string>;
let versionId: string;
let gappyVersionId: string;
let echoVersionId: string;
let fitId: string;
const VL = "https://vega.github.io/schema/vega-lite/v6.json";
const spec = (x: string, y = "signal") => ({
  $schema: VL,
  data: { name: "echo" },
  mark: "point",
  encoding: { x: { field: x, type: "quantitative" }, y: { field: y, type: "quantitative" } },
});

beforeAll(async () => {
  ({ tokens } = await setupTestApp());
  const up = async (name: string, text: string) =>
    (await call(upload.POST, { method: "POST", token: tokens.author, params: { id: DEMO_MANUSCRIPT_ID }, rawBody: uploadForm(name, text) })).json;
  versionId = (await up("echo-tus.csv", "t_us,signal\n1,0.9\n2,0.8\n4,0.6\n")).id;
  gappyVersionId = (await up("echo-gaps.csv", "t_us,signal\n1,0.9\n2,\n4,0.6\n8,NaN\n")).id;
  const echo = hahnEchoFiles()[0]!;
  echoVersionId = (await up(echo.fileName, echo.content)).id;
  fitId = (
    await call(analyses.POST, {
      method: "POST",
      token: tokens.author,
      body: { versionId: echoVersionId, model: "hahn_echo", options: { x: "tau", y: "signal", sigma: "sigma" } },
    })
  ).json.id;
}, 120_000);

async function newPanel() {
  const f = await call(figuresRoute.POST, { method: "POST", token: tokens.author, body: { manuscriptId: DEMO_MANUSCRIPT_ID, title: "Integrity" } });
  const p = await call(panelsRoute.POST, { method: "POST", token: tokens.author, params: { id: f.json.id }, body: { title: "echo" } });
  return { figureId: f.json.id as string, panelId: p.json.id as string };
}
const revise = (panelId: string, body: Record<string, unknown>) =>
  call(revisions.POST, {
    method: "POST",
    token: tokens.author,
    params: { id: panelId },
    body: { bindings: { echo: { versionId } }, baseRevisionId: null, message: "m", ...body },
  });

describe("spec ↔ data integrity at save", () => {
  it("the upload keeps each column's original header", async () => {
    const r = await call(upload.POST, {
      method: "POST",
      token: tokens.author,
      params: { id: DEMO_MANUSCRIPT_ID },
      rawBody: uploadForm("h.csv", "t_us,B [mT],signal\n1,2,3\n"),
    });
    expect(r.json.columns).toEqual([
      { name: "t", unit: "µs", type: "number", header: "t_us" },
      { name: "B", unit: "mT", type: "number", header: "B [mT]" },
      { name: "signal", unit: null, type: "number", header: "signal" },
    ]);
  });

  it("a field written as the file's header is refused with the field, the data, its columns and the column the header became", async () => {
    const { panelId } = await newPanel();
    const r = await revise(panelId, { spec: spec("t_us") });
    expect(r.status).toBe(422);
    expect(r.json.error.message).toBe(
      "spec: encoding.x.field: the field `t_us` is not a column of the data `echo` (columns: t, signal). Did you mean `t` (the column made from the header `t_us`)?",
    );
    expect(r.json.error.details).toEqual([
      {
        dataName: "echo",
        field: "t_us",
        written: "t_us",
        channel: "x",
        path: "encoding.x.field",
        pointer: "/encoding/x/field",
        columns: ["t", "signal"],
        suggestion: { column: "t", reason: "header", write: "t", text: "Did you mean `t` (the column made from the header `t_us`)?" },
        message: "the field `t_us` is not a column of the data `echo` (columns: t, signal). Did you mean `t` (the column made from the header `t_us`)?",
      },
    ]);
    const unitSpelling = await revise(panelId, { spec: spec("t (µs)") });
    expect(unitSpelling.status).toBe(422);
    expect(unitSpelling.json.error.message).toContain("Did you mean `t` (the column made from the header `t_us`)?");
    const fixed = await revise(panelId, { spec: spec("t") });
    expect(fixed.status).toBe(201);
  });

  it("fields made by transforms pass; a missing field in a filter or layer is refused", async () => {
    const { panelId } = await newPanel();
    const calculated = {
      $schema: VL,
      data: { name: "echo" },
      transform: [{ calculate: "datum.signal * 2", as: "double" }],
      layer: [{ mark: "point", encoding: { x: { field: "t", type: "quantitative" }, y: { field: "double", type: "quantitative" } } }],
    };
    expect((await revise(panelId, { spec: calculated })).status).toBe(201);
    const { panelId: p2 } = await newPanel();
    const filtered = { ...calculated, transform: [{ filter: "datum.Signal > 0" }] };
    const r = await revise(p2, { spec: filtered });
    expect(r.status).toBe(422);
    expect(r.json.error.message).toBe(
      "spec: transform[0].filter: the field `Signal` is not a column of the data `echo` (columns: t, signal). Did you mean `signal` (field names are case-sensitive)?; " +
        "layer[0].encoding.y.field: the field `double` is not a column of the data `echo` (columns: t, signal).",
    );
  });

  it("a revision bound to an analysis curve uses the derived file's columns", async () => {
    const { panelId } = await newPanel();
    const fitSpec = (x: string) => ({
      $schema: VL,
      data: { name: "fit" },
      transform: [{ filter: "datum['series'] === 'curve'" }],
      mark: "line",
      encoding: { x: { field: x, type: "quantitative" }, y: { field: "signal", type: "quantitative" } },
    });
    const bindings = { fit: { analysisId: fitId, output: "curve" } };
    const wrong = await revise(panelId, { spec: fitSpec("tau (µs)"), bindings });
    expect(wrong.status).toBe(422);
    expect(wrong.json.error.message).toBe(
      "spec: encoding.x.field: the field `tau (µs)` is not a column of the data `fit` (columns: series, tau, signal). Did you mean `tau` (the column made from the header `tau (µs)`)?",
    );
    const right = await revise(panelId, { spec: fitSpec("tau"), bindings });
    expect(right.status).toBe(201);
    const data = await call(revisionData.GET, { token: tokens.reviewer, params: { id: right.json.id } });
    expect(data.json.warnings).toEqual([]);
  });
});

describe("data warnings at render", () => {
  it("an old revision whose field the data lacks: warned in the data response, the panel, the figure and the manuscript's figure status", async () => {
    const { figureId, panelId } = await newPanel();
    // Saved before the check existed: straight into the database.
    const oldSpec = spec("t_us");
    const bound = await resolveBindings(DEMO_MANUSCRIPT_ID, { echo: { versionId } });
    const id = "old-revision-t-us";
    await getDb()
      .insert(revisionsTable)
      .values({
        id,
        panelId,
        number: 1,
        spec: canonicalJson(oldSpec),
        bindings: { echo: { versionId } },
        bound,
        message: "old",
        contentHash: revisionContentHash(oldSpec, bound),
        createdBy: "demo-author",
      });
    await getDb().update(panels).set({ currentRevisionId: id, reviewRequestedAt: new Date() }).where(eq(panels.id, panelId));

    const data = await call(revisionData.GET, { token: tokens.reviewer, params: { id } });
    expect(data.status).toBe(200);
    expect(data.json.warnings).toEqual([
      {
        kind: "missing_field",
        dataName: "echo",
        field: "t_us",
        columns: ["t", "signal"],
        suggestion: "t",
        message:
          "Nothing to draw: the field `t_us` is not a column of the data `echo` (columns: t, signal). Did you mean `t` (the column made from the header `t_us`)?",
      },
    ]);
    const p = await call(panel.GET, { token: tokens.reviewer, params: { id: panelId } });
    expect(p.json.dataWarnings).toEqual(data.json.warnings);
    const f = await call(figure.GET, { token: tokens.viewer, params: { id: figureId } });
    expect(f.json.panels.map((x: { dataWarnings: number }) => x.dataWarnings)).toEqual([1]);
    const m = await call(manuscript.GET, { token: tokens.viewer, params: { id: DEMO_MANUSCRIPT_ID } });
    const mine = m.json.figures.find((x: { id: string }) => x.id === figureId);
    expect(mine.panels.map((x: { dataWarnings: number }) => x.dataWarnings)).toEqual([1]);

    // Approval stays possible (the warning is advisory); the acknowledgement is recorded.
    const ok = await call(approvals.POST, {
      method: "POST",
      token: tokens.reviewer,
      params: { id: panelId },
      body: { revisionId: id, decision: "approved", acknowledgedWarnings: true },
    });
    expect(ok.status).toBe(201);
    const [entry] = await getDb()
      .select()
      .from(auditLog)
      .where(and(eq(auditLog.action, "review.approved"), eq(auditLog.target, `panel:${panelId}`)));
    expect(JSON.parse(entry!.data)).toMatchObject({ revisionId: id, acknowledgedWarnings: true });
  });

  it("rows without a number in a plotted quantitative field are counted", async () => {
    const { panelId } = await newPanel();
    const r = await revise(panelId, { spec: spec("t"), bindings: { echo: { versionId: gappyVersionId } } });
    expect(r.status).toBe(201);
    const data = await call(revisionData.GET, { token: tokens.viewer, params: { id: r.json.id } });
    expect(data.json.warnings).toEqual([
      {
        kind: "invalid_rows",
        dataName: "echo",
        field: "signal",
        rows: 2,
        of: 4,
        message: "2 of 4 rows of `echo` are not drawn: they have no number in `signal` (empty, NaN or text).",
      },
    ]);
  });
});
