import "server-only";
import { eq, inArray } from "drizzle-orm";
import { getDb } from "@/db/client";
import { datasets, versions } from "@/db/schema";
import { getModel } from "@/lib/analysis";
import { authorize, type SessionUser } from "@/lib/authz";
import { AppError, badRequest, notFound } from "@/lib/errors";
import { fitInPool, fitPoolSize } from "./fit-pool";
import { runAnalysis } from "./run-analysis";
import { batchInput, type BatchInput } from "./schemas";

/** A stored run as a batch reports it: what the results table shows, without the points. */
type BatchRun = Omit<Awaited<ReturnType<typeof runAnalysis>>, "data" | "curve">;

export type BatchEvent =
  | { type: "start"; total: number; workers: number }
  | { type: "result"; versionId: string; ok: true; run: BatchRun }
  | { type: "result"; versionId: string; ok: false; error: string }
  | { type: "end"; done: number; failed: number; cancelled: number };

/** Every version must belong to the manuscript; one that does not (or does not exist) is a 404 before anything runs. */
export async function checkVersions(manuscriptId: string, versionIds: string[]): Promise<void> {
  const unique = [...new Set(versionIds)];
  if (unique.length !== versionIds.length) throw badRequest("versionIds: a version is listed twice.");
  const rows = await getDb()
    .select({ id: versions.id, manuscriptId: datasets.manuscriptId })
    .from(versions)
    .innerJoin(datasets, eq(datasets.id, versions.datasetId))
    .where(inArray(versions.id, unique));
  const found = new Map(rows.map((r) => [r.id, r.manuscriptId]));
  const foreign = unique.find((id) => found.get(id) !== manuscriptId);
  if (foreign) throw notFound(`versionIds: no version ${foreign} in this manuscript.`);
}

/**
 * Fits one model over several versions on the fit pool (all cores) and stores each run exactly as
 * a single run is stored (runAnalysis). Yields a start event, one result per version as it
 * finishes (in finishing order), and an end event. When `signal` aborts, no further fit starts;
 * fits under way finish and are stored, and the end event counts the ones never started.
 */
export async function* runBatch(user: SessionUser, raw: BatchInput, signal?: AbortSignal): AsyncGenerator<BatchEvent> {
  const input = batchInput.parse(raw);
  await authorize(user, "analysis.run", input.manuscriptId);
  if (!getModel(input.model)) throw badRequest(`model: unknown model "${input.model}"; GET /api/analysis-models lists them.`);
  await checkVersions(input.manuscriptId, input.versionIds);
  const workers = fitPoolSize();
  yield { type: "start", total: input.versionIds.length, workers };

  const finished: BatchEvent[] = [];
  let wake: (() => void) | undefined;
  let next = 0;
  let running = 0;
  let done = 0;
  let failed = 0;
  const launch = () => {
    while (running < workers && next < input.versionIds.length && !signal?.aborted) {
      const versionId = input.versionIds[next++];
      running++;
      void runAnalysis(user, { versionId, model: input.model, options: input.options }, (job, data) =>
        fitInPool({ model: job.model, options: job.options, x: data.x, y: data.y, sigma: data.sigma, xUnit: data.xUnit }),
      )
        .then(
          ({ data: _points, curve: _curve, ...run }): BatchEvent => ({ type: "result", versionId, ok: true, run }),
          (err: Error): BatchEvent => {
            if (err instanceof AppError) return { type: "result", versionId, ok: false, error: err.message };
            console.error(`[prooflight] batch fit of version ${versionId} failed:`, err);
            return { type: "result", versionId, ok: false, error: "the fit failed on the server (logged)" };
          },
        )
        .then((event) => {
          running--;
          finished.push(event);
          wake?.();
        });
    }
  };
  launch();
  while (running > 0 || finished.length) {
    if (!finished.length) await new Promise<void>((resolve) => (wake = resolve));
    wake = undefined;
    for (const event of finished.splice(0)) {
      done++;
      if (event.type === "result" && !event.ok) failed++;
      yield event;
    }
    launch();
  }
  yield { type: "end", done, failed, cancelled: input.versionIds.length - next };
}
