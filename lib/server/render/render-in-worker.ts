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
import { fork, type ChildProcess } from "node:child_process";
import path from "node:path";
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
const STARTUP_TIMEOUT_MS = 20_000;
const MAX_IDLE_WORKERS = 2;
const JOBS_PER_WORKER = 100;
/** An idle worker (≈ 100 MB) is stopped after this long without work. */
const IDLE_MS = 60_000;

function renderWorkerPath(root: string = process.cwd()): string {
  return path.join(/* turbopackIgnore: true */ root, "lib", "server", "render", "worker", "render-worker.mjs");
}

interface PooledWorker {
  child: ChildProcess;
  heapMb: number;
  jobs: number;
  ready: Promise<void>;
  /** The tail of the child's stderr: tells an out-of-memory abort from other crashes. */
  stderr: string;
  idleTimer?: ReturnType<typeof setTimeout>;
}

type Reply = { type?: string; id?: number; ok?: boolean; result?: unknown; workMs?: number; error?: { code: RenderErrorCode; message: string } };

/** Time the last job spent rendering inside the worker, ms (the rest of its wall time is IPC). */
export let lastWorkerRenderMs = 0;

const idle: PooledWorker[] = [];
let nextId = 1;

function setRef(child: ChildProcess, on: boolean): void {
  const channel = child.channel as { ref?: () => void; unref?: () => void } | null | undefined;
  if (on) {
    child.ref();
    channel?.ref?.();
  } else {
    child.unref();
    channel?.unref?.();
  }
}

function spawn(heapMb: number): PooledWorker {
  const child = fork(renderWorkerPath(), [], {
    execArgv: [`--max-old-space-size=${heapMb}`],
    env: { NODE_ENV: "production" },
    serialization: "advanced",
    stdio: ["ignore", "ignore", "pipe", "ipc"],
  });
  const pooled: PooledWorker = { child, heapMb, jobs: 0, ready: Promise.resolve(), stderr: "" };
  child.stderr?.on("data", (d: Buffer) => {
    pooled.stderr = (pooled.stderr + d.toString("utf8")).slice(-4000);
  });
  pooled.ready = new Promise<void>((resolve, reject) => {
    const timer = setTimeout(() => reject(new RenderError("worker-failed", "the render worker did not start")), STARTUP_TIMEOUT_MS);
    const onMessage = (m: Reply) => {
      if (m?.type !== "ready") return;
      clearTimeout(timer);
      child.off("message", onMessage);
      resolve();
    };
    child.on("message", onMessage);
    child.once("error", (err) => {
      clearTimeout(timer);
      reject(new RenderError("worker-failed", `the render worker failed: ${err.message}`));
    });
    child.once("exit", (code, signal) => {
      clearTimeout(timer);
      reject(exitError(pooled, code, signal));
    });
  });
  pooled.ready.catch(() => undefined); // observed by the job that awaits it
  child.once("exit", () => {
    const i = idle.indexOf(pooled);
    if (i >= 0) idle.splice(i, 1);
  });
  return pooled;
}

function exitError(w: PooledWorker, code: number | null, signal: NodeJS.Signals | null): RenderError {
  if (/heap out of memory|Allocation failed/i.test(w.stderr)) {
    return new RenderError("out-of-memory", `the render needed more than its ${w.heapMb} MB memory budget`);
  }
  return new RenderError("worker-failed", `the render worker exited (${signal ?? code})`);
}

function acquire(heapMb: number): PooledWorker {
  const i = idle.findIndex((w) => w.heapMb === heapMb);
  if (i < 0) return spawn(heapMb);
  const w = idle.splice(i, 1)[0];
  clearTimeout(w.idleTimer);
  return w;
}

function release(w: PooledWorker): void {
  if (w.jobs < JOBS_PER_WORKER && idle.length < MAX_IDLE_WORKERS && w.child.connected) {
    setRef(w.child, false); // an idle worker must not keep the server (or a test run) alive
    w.idleTimer = setTimeout(() => {
      const i = idle.indexOf(w);
      if (i >= 0) idle.splice(i, 1);
      w.child.kill("SIGKILL");
    }, IDLE_MS);
    w.idleTimer.unref();
    idle.push(w);
  } else {
    w.child.kill("SIGKILL");
  }
}

async function runJob<T>(job: Record<string, unknown>, budget: RenderBudget = {}): Promise<T> {
  const timeoutMs = budget.timeoutMs ?? DEFAULT_TIMEOUT_MS;
  const pooled = acquire(budget.maxOldGenerationSizeMb ?? DEFAULT_HEAP_MB);
  const { child } = pooled;
  setRef(child, true);
  try {
    await pooled.ready;
  } catch (err) {
    child.kill("SIGKILL");
    throw err;
  }
  pooled.jobs++;
  const id = nextId++;
  return new Promise<T>((resolve, reject) => {
    let settled = false;
    const finish = (fn: () => void, keep: boolean) => {
      if (settled) return;
      settled = true;
      clearTimeout(timer);
      child.off("message", onMessage);
      child.off("exit", onExit);
      if (keep) release(pooled);
      else child.kill("SIGKILL");
      fn();
    };
    const onMessage = (m: Reply) => {
      if (m?.id !== id) return;
      lastWorkerRenderMs = m.workMs ?? 0;
      if (m.ok) finish(() => resolve(m.result as T), true);
      else finish(() => reject(new RenderError(m.error?.code ?? "render-failed", m.error?.message ?? "render failed")), true);
    };
    const onExit = (code: number | null, signal: NodeJS.Signals | null) => finish(() => reject(exitError(pooled, code, signal)), false);
    const timer = setTimeout(
      () => finish(() => reject(new RenderError("timeout", `the render took longer than its budget of ${timeoutMs} ms`)), false),
      timeoutMs,
    );
    child.on("message", onMessage);
    child.once("exit", onExit);
    child.send({ ...job, id }, (err) => {
      if (err) finish(() => reject(new RenderError("worker-failed", `the job could not be sent: ${err.message}`)), false);
    });
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
export async function stopRenderWorkers(): Promise<void> {
  const all = idle.splice(0);
  for (const w of all) clearTimeout(w.idleTimer);
  await Promise.all(
    all.map(
      (w) =>
        new Promise<void>((resolve) => {
          if (w.child.exitCode !== null || w.child.signalCode !== null) return resolve();
          w.child.once("exit", () => resolve());
          // Idle workers are unref'd; without a ref the process may leave before the exit event arrives.
          w.child.ref();
          w.child.kill("SIGKILL");
        }),
    ),
  );
}
