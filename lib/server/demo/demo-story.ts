import "server-only";
import { and, asc, count, eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { analyses, datasets, figures, versions, type Binding } from "@/db/schema";
import type { SessionUser } from "@/lib/authz";
import { demoFiles, type DemoFile } from "@/lib/demo-data";
import { DEMO_ACCOUNTS, DEMO_MANUSCRIPT_ID } from "@/lib/demo-data/accounts";
import { NV_NMR_FIELD_T } from "@/lib/demo-data/nv-nmr";
import { DARK_COUNTS } from "@/lib/demo-data/pl-spectrum";
import { commentDoc, darkSubtractedSpectrum, depthEstimate, populationTable, STORY_FIGURES, type PopulationRow, type StoryUpload } from "@/lib/demo-data/story";
import { getModel } from "@/lib/analysis";
import { withTemplateRecord } from "@/lib/figures/template-record";
import { getTemplate, type CommonOptions } from "@/lib/figures/templates";
import type { AnalysisInput } from "../analyses/schemas";
import { populationStatistics } from "../analyses/population";
import { runAnalysis } from "../analyses/run-analysis";
import { importDatasetFromBytes } from "../datasets/upload-dataset";
import { addPanel } from "../figures/panels";
import { createFigure, getFigure, updateFigure } from "../figures/figures";
import { createRevision } from "../figures/revisions";
import { env } from "@/lib/env";
import { flushNotices } from "../mail/notices";
import { deliverOutbox } from "../mail/outbox";
import { recordDecision, signOffFigure } from "../review/decisions";
import { sendToReview } from "../review/review-edges";
import { createThread, replyToThread } from "../review/threads";

/**
 * The demo manuscript in the middle of its review, told through the services the app uses (every
 * row written as a click or an API call would write it, audit entries and mails included):
 *
 * - stored fits: the twelve Hahn-echo runs (as the batch runs them), the six T1 runs, the ¹⁴N triplet
 *   of the NV06 ODMR, the Ramsey fringes of NV11 and the ¹H Larmor peak of NV12, each with its derived version;
 * - Figure 1 "Coherence across surface treatments": echo decay with fit and residuals, T2 and T1 by
 *   group; approved panel by panel by the reviewer, then signed off by the PI;
 * - Figure 2 "Shallow NV proton sensing": ODMR with the ¹⁴N fit (approved), the NV-NMR spectrum with
 *   the expected ¹H line (needs revision, a thread on an x-range with a reply, both with @mentions),
 *   the depth estimate (in review);
 * - Figure 3 "Charge state and saturation": PL map and PL spectrum, both approved, then version 2 of
 *   the spectrum uploaded and rebound, so the spectrum's approval is stale ("version 1 → 2").
 *
 * Told once: a demo manuscript that already has a figure (this story's, or someone's own work, whose
 * numbering must not move) is left alone. Deterministic: the same files, options and words every time.
 */
export async function seedDemoStory(): Promise<{ told: boolean; reason?: string }> {
  const db = getDb();
  const [{ n } = { n: 0 }] = await db.select({ n: count() }).from(figures).where(eq(figures.manuscriptId, DEMO_MANUSCRIPT_ID));
  if (n > 0) return { told: false, reason: "the demo manuscript already has figures" };
  const files = await demoVersions();
  if (!files) return { told: false, reason: "the demo measurement files are not all there" };

  const author = account("author");
  const reviewer = account("reviewer");
  const pi = account("pi");

  // Stored fits, one after the other as the batch runs them; a run already stored on the same version is kept.
  const echoRuns = await fitAll(
    author,
    files.filter((f) => f.file.kind === "hahn_echo"),
    "hahn_echo",
    { x: "tau", y: "signal", sigma: "sigma" },
  );
  const t1Runs = await fitAll(
    author,
    files.filter((f) => f.file.kind === "relaxation"),
    "relaxation",
    { x: "wait", y: "pl" },
  );
  const odmr = byFile(files, "odmr_K17-NV06_4p2mT.csv");
  // The m_s = 0 → −1 line at 4.2 mT sits near 2752 MHz; its three ¹⁴N lines are fitted in a 15 MHz window.
  const [odmrRun] = await fitAll(author, [odmr], "odmr_14n_triplet", { x: "frequency", y: "pl", xRange: [2745, 2760] });
  await fitAll(author, [byFile(files, "ramsey_K17-NV11.csv")], "ramsey_14n", { x: "t", y: "pl" });
  const nmr = byFile(files, "nvnmr_K17-NV12_XY8-16.csv");
  const [larmorRun] = await fitAll(author, [nmr], "lorentzian", { x: "frequency", y: "contrast" });

  // The author exports the population statistics and uploads them for the strip plots.
  const t2Table = await upload(author, populationTable("T2", "µs", getModel("hahn_echo")!.title, await population(author, "hahn_echo", "T2", echoRuns)));
  const t1Table = await upload(author, populationTable("T1", "ms", getModel("relaxation")!.title, await population(author, "relaxation", "T1", t1Runs)));
  const depth = depthEstimate();
  const depthTable = await upload(author, depth.file);

  // Figure 1: built by the author, approved panel by panel by the reviewer, signed off by the PI.
  const fig1 = await figure(author, STORY_FIGURES.coherence, reviewer);
  const echo = echoRuns.find((r) => r.centre === "NV09")!;
  const f1a = await panel(author, fig1, "Hahn echo, NV09 (oxygen-terminated)", "Echo of NV09 with the stored stretched-exponential fit; log τ axis, ± σ bars", {
    template: "decay-curve",
    options: { dataName: "echo", xField: "tau", yField: "signal", sigmaField: "sigma", fitName: "fit", residualName: "residuals", xScale: "log" },
    bindings: {
      echo: { versionId: echo.versionId },
      fit: { analysisId: echo.analysisId, output: "curve" },
      residuals: { analysisId: echo.analysisId, output: "residuals" },
    },
    colSpan: 2,
  });
  const strip = (valueField: string, valueName: string, unit: string) => ({
    dataName: "population",
    groupField: "group",
    valueField,
    groupName: "sample group",
    valueName,
    unit,
    summary: "mean-sd",
  });
  const f1b = await panel(author, fig1, "T₂ by sample group", "T2 of all twelve centres by group, mean ± sd and n", {
    template: "group-strip",
    options: strip("T2", "T₂", "µs"),
    bindings: { population: { versionId: t2Table } },
  });
  const f1c = await panel(author, fig1, "T₁ by sample group", "T1 of the six relaxation runs by group, mean ± sd and n", {
    template: "group-strip",
    options: strip("T1", "T₁", "ms"),
    bindings: { population: { versionId: t1Table } },
  });
  await decide(reviewer, f1a, "approved", "Fit and residuals look clean; the log axis shows the whole decay.");
  await decide(reviewer, f1b, "approved", "Group contrast is clear and n is on the plot.");
  await decide(reviewer, f1c, "approved");
  const signed = await getFigure(pi, fig1.id);
  await signOffFigure(pi, fig1.id, { figureHash: signed.figureHash });

  // Figure 2: one panel approved, one sent back after a thread on an x-range, one waiting for review.
  const fig2 = await figure(author, STORY_FIGURES.protons, reviewer);
  const tripletCentre = param(odmrRun, "f0");
  const split = param(odmrRun, "Apar");
  const f2a = await panel(author, fig2, "ODMR of NV06, ¹⁴N triplet (mI = −1, 0, +1)", "The ms = 0 → −1 line at 4.2 mT with the stored ¹⁴N triplet fit", {
    template: "spectrum",
    options: {
      dataName: "odmr",
      xField: "frequency",
      yField: "pl",
      fitName: "fit",
      xName: "microwave frequency",
      xUnit: "MHz",
      yName: "PL",
      yUnit: "norm.",
      markers: [-1, 0, 1].map((m) => ({ position: round(tripletCentre + m * split, 3), label: m === 0 ? "0" : m < 0 ? "−1" : "+1" })),
    },
    bindings: { odmr: { analysisId: odmrRun.analysisId, output: "data" }, fit: { analysisId: odmrRun.analysisId, output: "curve" } },
  });
  const fieldMt = round(NV_NMR_FIELD_T * 1000, 1);
  const f2b = await panel(
    author,
    fig2,
    "NV-NMR of the oil's protons, NV12",
    `XY8-16 spectrum with the stored Larmor-peak fit and the ¹H line at ${fieldMt} mT`,
    {
      template: "nv-nmr",
      options: { dataName: "nmr", xField: "frequency", yField: "contrast", fitName: "fit", nucleus: "1H", fieldMt, xQuantity: "frequency" },
      bindings: { nmr: { versionId: nmr.versionId }, fit: { analysisId: larmorRun.analysisId, output: "curve" } },
    },
  );
  // Panel c waits for the reviewer: a revision, no decision yet.
  await panel(author, fig2, "Depth of NV12", `B_rms of the oil's protons against depth; d = ${depth.depthNm.toFixed(1)} nm where it meets the measured value`, {
    template: "spectrum",
    options: {
      dataName: "depth",
      xField: "depth",
      yField: "B_rms",
      xName: "NV depth d",
      xUnit: "nm",
      yName: "B_rms",
      yUnit: "nT",
      yScale: "log",
      markers: [{ position: round(depth.depthNm, 2), label: `d = ${depth.depthNm.toFixed(1)} ± ${depth.depthErrNm.toFixed(1)} nm` }],
    },
    bindings: { depth: { versionId: depthTable } },
  });
  await decide(reviewer, f2a, "approved", "Triplet spacing and the fit agree; fine as it is.");
  const larmorMHz = round(param(larmorRun, "x0"), 4);
  const thread = await createThread(reviewer, f2b.panelId, {
    revisionId: f2b.revisionId,
    anchor: { type: "xrange", x0: round(larmorMHz - 0.06, 3), x1: round(larmorMHz + 0.06, 3) },
    body: commentDoc(
      { mention: author.id, label: author.name },
      ` The dip sits on the ¹H line, but the panel does not say how well the field is known: ±0.5 mT moves the line by ±21 kHz, about half its width. ` +
        `Please give the field with its uncertainty and the fitted centre with its error.`,
    ),
  });
  await clockTick(); // the reply must come strictly after the comment it answers (the queue compares times)
  await replyToThread(author, thread.id, {
    body: commentDoc(
      { mention: reviewer.id, label: reviewer.name },
      ` The field comes from the ODMR of NV12 at the same magnet position; I will put it on the marker with its uncertainty and add the fitted ${larmorMHz} MHz with its error.`,
    ),
  });
  await decide(reviewer, f2b, "needs_revision", "State the bias field with its uncertainty and the fitted ¹H centre ± error on the panel.");

  // Figure 3: both panels approved, then a new version of the spectrum rebound: that approval turns stale.
  const fig3 = await figure(author, STORY_FIGURES.chargeState, reviewer);
  const map = byFile(files, "plmap_K17-annealed_scan07.csv");
  const spectrum = byFile(files, "pl-spectrum_K17-as-grown_spot2.csv");
  const f3a = await panel(author, fig3, "PL scan 07, annealed region", "Confocal scan with a 5 µm scale bar", {
    template: "pl-map",
    options: { dataName: "plmap", xField: "x", yField: "y", valueField: "value", pixelUm: 1 / 3, scaleBarUm: 5, colorTitle: "count rate (counts/s)" },
    bindings: { plmap: { versionId: map.versionId } },
    heightMm: 80,
  });
  const f3b = await panel(author, fig3, "PL spectrum, as-grown spot 2", "Spectrum with the NV⁰ and NV⁻ zero-phonon lines", {
    template: "spectrum",
    options: { dataName: "spectrum", xField: "wavelength", yField: "counts", yName: "PL", yUnit: "counts" },
    bindings: { spectrum: { versionId: spectrum.versionId } },
  });
  await decide(reviewer, f3a, "approved");
  await decide(reviewer, f3b, "approved", "Both zero-phonon lines are marked; good.");
  const v2 = darkSubtractedSpectrum(spectrum.file, DARK_COUNTS);
  const spectrumV2 = await importDatasetFromBytes(author, DEMO_MANUSCRIPT_ID, v2.fileName, new TextEncoder().encode(v2.content), {
    datasetId: spectrum.datasetId,
  });
  await createRevision(author, f3b.panelId, {
    spec: f3b.spec,
    bindings: { spectrum: { versionId: spectrumV2.id } },
    baseRevisionId: f3b.revisionId,
    message: `Rebind “spectrum” to ${spectrum.file.name} version ${spectrumV2.number}`,
  });

  // The notices these events wrote go out now, one mail per person (as the outbox worker would send
  // them a minute later), through the outbox if a mail server listens, otherwise once the worker runs.
  await flushNotices(Date.now() + env().mailCoalesceMs);
  await deliverOutbox().catch(() => 0);
  return { told: true };
}

type Account = SessionUser;

/** A demo account by its role on the demo manuscript, as the session would carry it. */
function account(role: "pi" | "author" | "reviewer"): Account {
  const a = DEMO_ACCOUNTS.find((x) => x.role === role)!;
  return { id: a.id, email: a.email, name: a.name };
}

interface DemoVersion {
  file: DemoFile;
  datasetId: string;
  versionId: string;
}

/** Version 1 of every demo measurement file, as the seed uploaded it; null when one is missing. */
async function demoVersions(): Promise<DemoVersion[] | null> {
  const rows = await getDb()
    .select({ datasetId: datasets.id, name: datasets.name, versionId: versions.id, fileName: versions.fileName })
    .from(datasets)
    .innerJoin(versions, eq(versions.datasetId, datasets.id))
    .where(and(eq(datasets.manuscriptId, DEMO_MANUSCRIPT_ID), eq(versions.number, 1)))
    .orderBy(asc(datasets.name));
  const out: DemoVersion[] = [];
  for (const file of demoFiles()) {
    const row = rows.find((r) => r.fileName === file.fileName && r.name === file.name);
    if (!row) return null;
    out.push({ file, datasetId: row.datasetId, versionId: row.versionId });
  }
  return out;
}

function byFile(files: DemoVersion[], fileName: string): DemoVersion {
  const f = files.find((x) => x.file.fileName === fileName);
  if (!f) throw new Error(`demo story: no demo file ${fileName}`);
  return f;
}

interface Run {
  analysisId: string;
  versionId: string;
  centre: string;
  group: string;
  parameters: Array<{ name: string; value: number | null; stderr: number | null }>;
}

/** Fits each version with the model (or keeps the run already stored there with that model). */
async function fitAll(user: Account, files: DemoVersion[], model: string, options: AnalysisInput["options"]): Promise<Run[]> {
  const runs: Run[] = [];
  for (const f of files) {
    const [stored] = await getDb()
      .select({ id: analyses.id, result: analyses.result })
      .from(analyses)
      .where(and(eq(analyses.versionId, f.versionId), eq(analyses.model, model)))
      .orderBy(asc(analyses.createdAt));
    const run = stored
      ? { id: stored.id, parameters: (stored.result as { parameters: Run["parameters"] }).parameters }
      : await runAnalysis(user, { versionId: f.versionId, model, options });
    runs.push({ analysisId: run.id, versionId: f.versionId, centre: f.file.tags.centre ?? "", group: f.file.tags.group ?? "", parameters: run.parameters });
  }
  return runs;
}

function param(run: Run, name: string): number {
  const value = run.parameters.find((p) => p.name === name)?.value;
  if (typeof value !== "number") throw new Error(`demo story: the ${name} of analysis ${run.analysisId} did not come out`);
  return value;
}

/** The statistics view's members of one parameter, with the centre each run belongs to. */
async function population(user: Account, model: string, parameter: string, runs: Run[]): Promise<PopulationRow[]> {
  const stats = await populationStatistics(user, DEMO_MANUSCRIPT_ID, model, parameter, "group");
  return stats.members.flatMap((m) => {
    const run = runs.find((r) => r.analysisId === m.analysisId);
    return run ? [{ centre: run.centre, group: m.group, value: m.value, stderr: m.stderr }] : [];
  });
}

/** Uploads a file as a new dataset, as the upload form would; returns the version id. */
async function upload(user: Account, f: StoryUpload): Promise<string> {
  const v = await importDatasetFromBytes(user, DEMO_MANUSCRIPT_ID, f.fileName, new TextEncoder().encode(f.content), {
    name: f.name,
    metadata: JSON.stringify(f.metadata),
  });
  return v.id;
}

interface FigureRef {
  id: string;
  widthMm: number;
  columns: number;
}

/** A new figure with the reviewer as its required reviewer. */
async function figure(user: Account, layout: { title: string; widthMm: number; columns: number }, reviewer: Account): Promise<FigureRef> {
  const f = await createFigure(user, { manuscriptId: DEMO_MANUSCRIPT_ID, ...layout });
  await updateFigure(user, f.id, { requiredReviewers: [reviewer.id] });
  return { id: f.id, widthMm: f.widthMm, columns: f.columns };
}

interface PanelRef {
  panelId: string;
  revisionId: string;
  spec: Record<string, unknown>;
}

/** Width of a panel spanning `span` grid columns, mm (2 mm gutters), as the builder proposes it. */
function panelWidthMm(f: FigureRef, span: number): number {
  const col = (f.widthMm - 2 * (f.columns - 1)) / f.columns;
  return Math.round((col * span + 2 * (span - 1)) * 10) / 10;
}

/** A panel with its first revision, sent to review, its spec built by a figure template as the builder would (the options recorded in it). */
async function panel(
  user: Account,
  f: FigureRef,
  title: string,
  message: string,
  build: { template: string; options: Record<string, unknown>; bindings: Record<string, Binding>; heightMm?: number; colSpan?: number },
): Promise<PanelRef> {
  const template = getTemplate(build.template);
  if (!template) throw new Error(`demo story: no figure template ${build.template}`);
  const colSpan = build.colSpan ?? 1;
  const options = { ...build.options, print: { widthMm: panelWidthMm(f, colSpan), heightMm: build.heightMm ?? 55 } } as Partial<CommonOptions>;
  const spec = withTemplateRecord(template.build(options), { id: template.id, options });
  const p = await addPanel(user, f.id, { title, colSpan });
  const rev = await createRevision(user, p.id, { spec, bindings: build.bindings, baseRevisionId: null, message });
  // Every demo panel is past its draft: its author sent it to review with its first revision.
  await sendToReview(user, p.id);
  return { panelId: p.id, revisionId: rev.id, spec };
}

async function decide(user: Account, p: PanelRef, decision: "approved" | "needs_revision", note?: string) {
  await recordDecision(user, p.panelId, { revisionId: p.revisionId, decision, ...(note ? { note } : {}) });
}

/** v to a number of decimals, for labels and anchors a person would type. */
const round = (v: number, decimals: number) => Number(v.toFixed(decimals));

/** Waits until the millisecond clock has moved on, so two events in a row never share a timestamp. */
async function clockTick(): Promise<void> {
  const start = Date.now();
  while (Date.now() === start) await new Promise((r) => setTimeout(r, 1));
}
