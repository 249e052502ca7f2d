import "server-only";
import { getModel } from "@/lib/analysis";
import { bootstrapDraws, summariseBootstrap } from "@/lib/analysis/bootstrap";
import { authorize, type SessionUser } from "@/lib/authz";
import { badRequest } from "@/lib/errors";
import { manuscriptOfVersion } from "../datasets/scope";
import { fitInputOf } from "./fit-job";
import { loadFitData } from "./fit-data";
import { curveFor, describeRun, fitOrExplain } from "./run-analysis";
import { analysisInput, type AnalysisInput } from "./schemas";

/** Draws between progress events; small enough that other requests are served in between. */
const CHUNK = 25;

export type BootstrapEvent =
  | { type: "progress"; done: number; total: number }
  | { type: "done"; run: ReturnType<typeof describeRun> }
  | { type: "cancelled"; done: number; total: number };

const nextTurn = () => new Promise<void>((resolve) => setImmediate(resolve));

/**
 * A fit with bootstrap intervals, nothing stored: the fit, then the draws in chunks, yielding
 * progress after each chunk and giving the event loop back in between. The draws are seeded per
 * index, so the intervals equal those the stored run will compute from the same options.
 */
export async function* previewWithBootstrap(user: SessionUser, raw: AnalysisInput, signal?: AbortSignal): AsyncGenerator<BootstrapEvent> {
  const input = analysisInput.parse(raw);
  const settings = input.options.bootstrap;
  if (!settings) throw badRequest("options.bootstrap: give the number of draws and a seed, e.g. { draws: 1000, seed: 1 }.");
  await authorize(user, "analysis.run", await manuscriptOfVersion(input.versionId));
  const data = await loadFitData(input.versionId, input.options);
  const fit = fitOrExplain({ model: input.model, options: { ...input.options, bootstrap: undefined } }, data);
  const model = getModel(input.model)!;
  const job = fitInputOf({ model: input.model, options: input.options, x: data.x, y: data.y, sigma: data.sigma, xUnit: data.xUnit });
  const draws: ReturnType<typeof bootstrapDraws> = [];
  yield { type: "progress", done: 0, total: settings.draws };
  while (draws.length < settings.draws) {
    await nextTurn();
    if (signal?.aborted) {
      yield { type: "cancelled", done: draws.length, total: settings.draws };
      return;
    }
    const from = draws.length;
    draws.push(...bootstrapDraws(model, job, fit, settings.seed, from, Math.min(settings.draws, from + CHUNK)));
    yield { type: "progress", done: draws.length, total: settings.draws };
  }
  fit.bootstrap = summariseBootstrap(model, fit, draws, settings);
  yield { type: "done", run: describeRun(input, data, fit, curveFor(input.model, fit, data.x)) };
}
