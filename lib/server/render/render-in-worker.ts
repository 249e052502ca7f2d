/**
 * Server renders under a budget: each job runs in a separate Node process (the render worker,
 * child_process.fork with an IPC channel) whose heap is capped with --max-old-space-size and
 * which is killed at the job's wall-clock budget, failing with RenderError("timeout"); a child
 * that runs out of memory fails the job with "out-of-memory". Either way the server process is
 * untouched and the route can answer 422.
 *
 * Why a process and not a worker_threads Worker with resourceLimits: V8 aborts the whole
 * process on some out-of-memory paths (one array grown past the limit — exactly what a huge
 * Vega `sequence` does), even inside a worker (nodejs/node#47224). The child gets an empty
 * environment (no secrets) and only the heap flags as execArgv.
 *
 * Warm children are reused; one that timed out, crashed or ran out of memory is discarded. The
 * worker file is plain .mjs found from process.cwd() rather than `new URL(…, import.meta.url)`,
 * which Next.js bundling may rewrite; vega, vega-lite and vega-interpreter must be in
 * `serverExternalPackages` and in node_modules at run time (true for `next start`; a standalone
 * output would need lib/server/render/worker and those packages copied alongside).
 */
import "server-only";
import path from "node:path";
import { ChildPool, ranOutOfMemory, type PooledChild } from "../child-pool";
import type { ComposedFigure, FigureLayout } from "./worker/compose-core.mjs";
import type { BoundData, PhysicalSize, RenderedSvg } from "./worker/render-core.mjs";
import { RenderError, type RenderErrorCode } from "./worker/render-error.mjs";

// Route handlers can take everything they need from here without pulling Vega into the bundle.
export { RenderError } from "./worker/render-error.mjs";
export type { BoundData, PhysicalSize, RenderedSvg } from "./worker/render-core.mjs";
export type { FigureLayout } from "./worker/compose-core.mjs";

export interface RenderBudget {
  /** Wall-clock budget of one job once the worker is ready, ms (default 10 000). */
  timeoutMs?: number;
  /** V8 old-generation heap cap of the worker process, MB (default 512). */
  maxOldGenerationSizeMb?: number;
}

export interface FigurePanelJob {
  letter: string;
  spec: unknown;
  data: BoundData;
  span?: number;
  heightMm?: number;
}

export type RenderedFigure = ComposedFigure & { warnings: string[] };

const DEFAULT_TIMEOUT_MS = 10_000;
const DEFAULT_HEAP_MB = 512;

const pool = new ChildPool({
  script: () => path.join(/* turbopackIgnore: true */ process.cwd(), "lib", "server", "render", "worker", "render-worker.mjs"),
  execArgv: (heapMb) => [`--max-old-space-size=${heapMb}`],
  serialization: "advanced",
  startupTimeoutMs: 20_000,
  maxIdle: 2,
  jobsPerChild: 100,
  // An idle worker (≈ 100 MB) is stopped after this long without work.
  idleMs: 60_000,
});

type Reply = { id?: number; ok?: boolean; result?: unknown; workMs?: number; error?: { code: RenderErrorCode; message: string } };

/** Time the last job spent rendering inside the worker, ms (the rest of its wall time is IPC). */
export let lastWorkerRenderMs = 0;

function crashError(w: PooledChild, how: string): RenderError {
  if (ranOutOfMemory(w)) return new RenderError("out-of-memory", `the render needed more than its ${w.heapMb} MB memory budget`);
  return new RenderError("worker-failed", `the render worker ${how}`);
}

function runJob<T>(job: Record<string, unknown>, budget: RenderBudget = {}): Promise<T> {
  const timeoutMs = budget.timeoutMs ?? DEFAULT_TIMEOUT_MS;
  return pool.run<T, Reply>(job, budget.maxOldGenerationSizeMb ?? DEFAULT_HEAP_MB, timeoutMs, {
    reply: (m) => {
      lastWorkerRenderMs = m.workMs ?? 0;
      if (m.ok) return { value: m.result as T };
      return { error: new RenderError(m.error?.code ?? "render-failed", m.error?.message ?? "render failed"), keep: true };
    },
    notStarted: (w, reason) => crashError(w, `did not start: ${reason.message}`),
    exited: (w, code, signal) => crashError(w, `exited (${signal ?? code})`),
    timedOut: () => new RenderError("timeout", `the render took longer than its budget of ${timeoutMs} ms`),
  });
}

/** renderSpecToSvg in a budgeted worker process. */
export function renderSpecInWorker(spec: unknown, data: BoundData, size: PhysicalSize, budget?: RenderBudget): Promise<RenderedSvg> {
  return runJob<RenderedSvg>({ kind: "panel", spec, data, size }, budget);
}

/** Renders every panel at its cell width and composes the lettered figure, in one budgeted job. */
export function renderFigureInWorker(panels: FigurePanelJob[], layout: FigureLayout, widthMm: number, budget?: RenderBudget): Promise<RenderedFigure> {
  return runJob<RenderedFigure>({ kind: "figure", panels, layout, widthMm }, budget);
}

/** What a PDF or print raster may take: a figure near the vector cap takes pdfkit seconds and a few hundred MB. */
const DRAW_BUDGET: RenderBudget = { timeoutMs: 120_000, maxOldGenerationSizeMb: 1024 };

/** A PDF ("pdf") or print raster ("raster") drawn from a checked SVG in a worker, so the server never holds the drawing. */
export function drawInWorker<T>(job: { kind: "pdf" | "raster"; svg: string; options: unknown }): Promise<T> {
  return runJob<T>(job, DRAW_BUDGET);
}

/** Stops the idle workers (tests, graceful shutdown). */
export function stopRenderWorkers(): Promise<void> {
  return pool.stopIdle();
}
