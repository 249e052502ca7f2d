import "server-only";
import { eq } from "drizzle-orm";
import { strFromU8 } from "fflate";
import { getDb } from "@/db/client";
import { analyses, versions, type BoundInput } from "@/db/schema";
import { getModel } from "@/lib/analysis";
import { authorize, type SessionUser } from "@/lib/authz";
import { env } from "@/lib/env";
import { badRequest, unprocessable } from "@/lib/errors";
import { appendAudit } from "../audit";
import { newId } from "../crypto";
import { importDatasetFromBytes } from "../datasets/upload-dataset";
import { createFigure } from "../figures/figures";
import { addPanel } from "../figures/panels";
import { createRevision } from "../figures/revisions";
import type { FigureTrace } from "../figures/trace";
import { consumeRate } from "../limits/rate-limit";
import { readFileBytes, removeTemp } from "../storage/blob-store";
import { readMultipartUpload } from "../storage/multipart";
import { acquireUploadSlot } from "../storage/upload-slots";
import { BUNDLE_PATHS, type BundleParseRecord, type BundleRender } from "./bundle-layout";
import type { StoredFit } from "./fit-report";
import { unpackArchive } from "./safe-unzip";
import { verifyBundle } from "./verify-bundle";

const IMPORTS_PER_HOUR = 20;

type TraceVersion = Extract<FigureTrace["panels"][number]["inputs"][number], { kind: "version" }>["version"];

export interface ImportReport {
  bundleSha256: string;
  figureId: string;
  figureNumber: number;
  datasets: Array<{ id: string; name: string; versions: number }>;
  analyses: number;
  panels: number;
  /** Review decisions and sign-offs in the bundle: history, not approvals here. */
  reviewHistory: { decisions: number; signoffs: number };
  note: string;
}

/** POST /api/manuscripts/{id}/bundles/import: the multipart `file` part is the bundle's zip. */
export async function importUploadedBundle(user: SessionUser, manuscriptId: string, req: Request): Promise<ImportReport> {
  await authorize(user, "bundle.import", manuscriptId);
  const release = acquireUploadSlot(user.id);
  try {
    await consumeRate([
      {
        bucket: `bundle-import:user:${user.id}`,
        max: IMPORTS_PER_HOUR,
        windowMs: 3600_000,
        message: `You have imported ${IMPORTS_PER_HOUR} bundles in the last hour.`,
      },
    ]);
    const { file } = await readMultipartUpload(req, env().uploadMaxBytes);
    if (!file) throw badRequest("file: the multipart body has no `file` part (the bundle's .zip).");
    try {
      return await importBundle(user, manuscriptId, await readFileBytes(file.tmp));
    } finally {
      await removeTemp(file.tmp);
    }
  } finally {
    release();
  }
}

function json<T>(files: Record<string, Uint8Array>, path: string): T {
  const bytes = files[path];
  if (!bytes) throw unprocessable(`The bundle has no ${path}.`);
  return JSON.parse(strFromU8(bytes)) as T;
}

interface PanelBindings {
  panel: string;
  revision: { number: number; message?: string; createdByName?: string };
  bound: Record<string, BoundInput>;
}

/**
 * Recreates a verified bundle in a manuscript: each raw file as a dataset version (same bytes, so the
 * same SHA-256, parsed with the recorded options), each fit as a stored run with the recorded result
 * and its derived file (the bundle's bytes, which the check re-fitted to 1e-6), and the figure with its
 * panels and one revision each, bound to the new versions and runs. Everything is marked imported from
 * the bundle's hash. Review decisions and sign-offs are not carried over as approvals: the new group
 * reviews the figure again; the bundle's own trail stays in the bundle, and the count is recorded.
 *
 * The bundle is checked in full first (verifyBundle: hashes, parses, rows, fits, render); a bundle
 * that does not verify, or that is unsafe to unpack, is refused before anything is written.
 */
async function importBundle(user: SessionUser, manuscriptId: string, zipBytes: Uint8Array): Promise<ImportReport> {
  await authorize(user, "bundle.import", manuscriptId);
  const check = await verifyBundle(zipBytes);
  if (!check.ok) {
    const failed = check.rows.filter((r) => !r.match);
    throw unprocessable(
      `The bundle does not verify, so nothing was imported: ${failed
        .slice(0, 3)
        .map((r) => `${r.item} (${r.check}): ${r.detail}`)
        .join("; ")}${failed.length > 3 ? `; and ${failed.length - 3} more` : ""}.`,
      { rows: failed },
    );
  }
  const files = unpackArchive(zipBytes);
  const sha = check.bundleSha256;
  const mark = `Imported from bundle ${sha}`;
  const trace = json<FigureTrace>(files, "trace.json");
  const render = json<BundleRender>(files, BUNDLE_PATHS.render);
  const parsed = json<Record<string, BundleParseRecord>>(files, BUNDLE_PATHS.parsed);
  const fileOf = new Map(Object.entries(parsed).map(([path, rec]) => [rec.versionId, { path, rec }]));
  const fits = new Map<string, StoredFit>();
  for (const path of Object.keys(files))
    if (path.startsWith("fits/") && path.endsWith(".json")) {
      const fit = JSON.parse(strFromU8(files[path])) as StoredFit;
      fits.set(fit.id, fit);
    }
  const panelBindings = new Map(render.panels.map((p) => [p.letter, json<PanelBindings>(files, `specs/panel-${p.letter}.bindings.json`)]));

  // Everything the import needs, checked before the first write.
  const rawVersions = new Map<string, TraceVersion>();
  for (const p of trace.panels)
    for (const input of p.inputs) {
      const v = input.kind === "version" ? input.version : input.input;
      if (!v.derivedFromAnalysisId) rawVersions.set(v.versionId, v);
    }
  for (const v of rawVersions.values())
    if (!fileOf.has(v.versionId)) throw unprocessable(`The bundle lists version ${v.number} of “${v.dataset}” but holds no file for it.`);
  for (const fit of fits.values()) {
    if (!getModel(fit.model)) throw unprocessable(`The bundle's fit ${fit.id} uses the model “${fit.model}”, which this installation does not have.`);
    if (!rawVersions.has(fit.input.versionId) || !fileOf.has(fit.derived.versionId))
      throw unprocessable(`The bundle's fit ${fit.id} lacks its input or derived file.`);
  }
  for (const [letter, b] of panelBindings)
    for (const [name, bound] of Object.entries(b.bound)) {
      const known = bound.kind === "analysis" ? fits.has(bound.id) : rawVersions.has(bound.versionId);
      if (!known) throw unprocessable(`Panel ${letter} binds “${name}” to data the bundle does not hold.`);
    }

  // Datasets and versions, oldest version first within each dataset.
  const versionIds = new Map<string, string>();
  const datasetIds = new Map<string, string>();
  const created: ImportReport["datasets"] = [];
  for (const v of [...rawVersions.values()].sort((a, b) => a.datasetId.localeCompare(b.datasetId) || a.number - b.number)) {
    const { path, rec } = fileOf.get(v.versionId)!;
    const existing = datasetIds.get(v.datasetId);
    const metadata = { kind: v.datasetKind ?? "other", sample: v.sample ?? null, notes: `${mark} (version ${v.number} there).` };
    const version = await importDatasetFromBytes(user, manuscriptId, rec.fileName, files[path], {
      ...(existing ? { datasetId: existing } : { name: v.dataset, metadata: JSON.stringify(metadata) }),
      ...parseFields(rec),
    });
    versionIds.set(v.versionId, version.id);
    if (!existing) {
      datasetIds.set(v.datasetId, version.datasetId);
      created.push({ id: version.datasetId, name: v.dataset, versions: 0 });
    }
    created.find((d) => d.id === version.datasetId)!.versions++;
  }

  // Fits: the recorded run and its derived file, as they were made.
  const analysisIds = new Map<string, string>();
  for (const fit of [...fits.values()].sort((a, b) => a.id.localeCompare(b.id))) {
    const { path, rec } = fileOf.get(fit.derived.versionId)!;
    const source = rawVersions.get(fit.input.versionId)!;
    const id = newId();
    analysisIds.set(fit.id, id);
    // The run is recorded with its derived version, in one transaction.
    await importDatasetFromBytes(
      user,
      manuscriptId,
      rec.fileName,
      files[path],
      {
        name: `${source.dataset} — fit: ${getModel(fit.model)!.title}`,
        metadata: JSON.stringify({
          kind: source.datasetKind ?? "other",
          sample: source.sample ?? null,
          notes: `${mark}.`,
          tags: { derivedFrom: datasetIds.get(source.datasetId)!, model: fit.model },
        }),
        ...parseFields(rec),
      },
      async (tx, derived) => {
        await tx.insert(analyses).values({
          id,
          manuscriptId,
          versionId: versionIds.get(fit.input.versionId)!,
          inputSha256: fit.inputSha256,
          model: fit.model,
          modelVersion: fit.modelVersion,
          options: fit.options as never,
          result: fit.result,
          derivedVersionId: derived.id,
          createdBy: user.id,
        });
        await tx.update(versions).set({ derivedFromAnalysisId: id }).where(eq(versions.id, derived.id));
        await appendAudit(tx, {
          actorId: user.id,
          manuscriptId,
          action: "analysis.import",
          target: `analysis:${id}`,
          data: { bundleSha256: sha, bundleAnalysisId: fit.id, model: fit.model },
        });
      },
    );
  }

  // The figure, its panels and one revision each.
  const figure = await createFigure(user, {
    manuscriptId,
    title: trace.figure.title,
    widthMm: render.widthMm,
    columns: render.columns,
    shareYTitles: render.shareYTitles,
  });
  for (const p of render.panels) {
    const b = panelBindings.get(p.letter)!;
    const tracePanel = trace.panels.find((x) => x.letter === p.letter);
    const panel = await addPanel(user, figure.id, { colSpan: p.span, ...(tracePanel?.title ? { title: tracePanel.title } : {}) });
    const bindings = Object.fromEntries(
      Object.entries(b.bound).map(([name, bound]) => [
        name,
        bound.kind === "analysis"
          ? { analysisId: analysisIds.get(bound.id)!, output: bound.output as "curve" }
          : { versionId: versionIds.get(bound.versionId)! },
      ]),
    );
    const by = tracePanel?.revision?.createdByName ? ` by ${tracePanel.revision.createdByName}` : "";
    const said = tracePanel?.revision?.message ? `: “${tracePanel.revision.message}”` : "";
    await createRevision(user, panel.id, {
      spec: json<Record<string, unknown>>(files, p.spec),
      bindings,
      baseRevisionId: null,
      message: `${mark} (panel ${p.letter}, revision ${b.revision.number}${by}${said}).`.slice(0, 2000),
    });
  }
  const reviewHistory = { decisions: trace.decisions.length, signoffs: trace.signoffs.length };
  await getDb().transaction(async (tx) => {
    await appendAudit(tx, {
      actorId: user.id,
      manuscriptId,
      action: "bundle.import",
      target: `figure:${figure.id}`,
      data: { bundleSha256: sha, datasets: created.length, analyses: analysisIds.size, panels: render.panels.length, reviewHistoryNotImported: reviewHistory },
    });
  });
  return {
    bundleSha256: sha,
    figureId: figure.id,
    figureNumber: figure.number,
    datasets: created,
    analyses: analysisIds.size,
    panels: render.panels.length,
    reviewHistory,
    note: `${mark}. Review decisions (${reviewHistory.decisions}) and sign-offs (${reviewHistory.signoffs}) stay in the bundle as history; the figure is reviewed again here.`,
  };
}

/** The upload fields that make the parse repeat the recorded one. */
function parseFields(rec: BundleParseRecord): Record<string, string> {
  const delimiter = rec.delimiter === "\t" ? "tab" : rec.delimiter;
  return {
    ...(rec.format && rec.format !== "auto" ? { format: rec.format } : {}),
    ...(delimiter ? { delimiter } : {}),
    ...(rec.decimal ? { decimal: rec.decimal } : {}),
  };
}
