/**
 * Batch fits on every core: a pool of worker threads (FIT_WORKERS, default one per core) that run
 * the pure fitter (fit-worker/), fed from one queue. Threads rather than processes because a fit
 * holds only the points it is sent (already in the server's memory) and no files; the parent
 * reads the data and stores the runs, so a worker never touches the database.
 *
 * Workers start on first use (tsx compiles the fit code once per thread, which takes a moment) and
 * are ended after IDLE_MS without work; an idle worker does not keep the process alive.
 */
import "server-only";
import path from "node:path";
import { Worker } from "node:worker_threads";
import type { ModelFitResult } from "@/lib/analysis";
import { env } from "@/lib/env";
import { badRequest } from "@/lib/errors";
import type { FitJob } from "./fit-job";

const IDLE_MS = 60_000;
const STARTUP_TIMEOUT_MS = 60_000;

type Reply = { type?: "ready"; id?: number; ok?: boolean; fit?: ModelFitResult; message?: string; fault?: string };

interface PoolWorker {
  worker: Worker;
  ready: Promise<void>;
  busy: boolean;
  idleTimer?: ReturnType<typeof setTimeout>;
}

interface Pending {
  id: number;
  job: FitJob;
  resolve: (fit: ModelFitResult) => void;
  reject: (err: Error) => void;
}

/** How many fits run at once: FIT_WORKERS when set (1–64), else one per core. */
export function fitPoolSize(): number {
  return env().fitWorkers;
}

const workers: PoolWorker[] = [];
const queue: Pending[] = [];
let nextId = 1;

function workerPath(): string {
  return path.join(/* turbopackIgnore: true */ process.cwd(), "lib", "server", "analyses", "fit-worker", "fit-worker.mjs");
}

function start(): PoolWorker {
  const worker = new Worker(workerPath(), { execArgv: ["--conditions=react-server"], env: { NODE_ENV: "production" } });
  const entry: PoolWorker = { worker, busy: false, ready: Promise.resolve() };
  entry.ready = new Promise<void>((resolve, reject) => {
    const timer = setTimeout(() => reject(new Error("a fit worker did not start")), STARTUP_TIMEOUT_MS);
    const onMessage = (m: Reply) => {
      if (m?.type !== "ready") return;
      clearTimeout(timer);
      worker.off("message", onMessage);
      resolve();
    };
    worker.on("message", onMessage);
    worker.once("error", (err) => {
      clearTimeout(timer);
      reject(err);
    });
  });
  entry.ready.catch(() => undefined); // observed by the job that awaits it
  worker.once("exit", () => {
    const i = workers.indexOf(entry);
    if (i >= 0) workers.splice(i, 1);
  });
  workers.push(entry);
  return entry;
}

function idle(entry: PoolWorker): void {
  entry.busy = false;
  entry.worker.unref();
  clearTimeout(entry.idleTimer);
  entry.idleTimer = setTimeout(() => void entry.worker.terminate(), IDLE_MS);
  entry.idleTimer.unref();
}

async function runOn(entry: PoolWorker, pending: Pending): Promise<void> {
  const { worker } = entry;
  entry.busy = true;
  clearTimeout(entry.idleTimer);
  worker.ref();
  try {
    await entry.ready;
  } catch (err) {
    void worker.terminate();
    pending.reject(new Error(`a fit worker could not start: ${(err as Error).message}`));
    return;
  }
  await new Promise<void>((settle) => {
    const done = (fn: () => void, keep: boolean) => {
      worker.off("message", onMessage);
      worker.off("error", onError);
      if (keep) idle(entry);
      else void worker.terminate();
      fn();
      settle();
    };
    const onMessage = (m: Reply) => {
      if (m?.id !== pending.id) return;
      if (m.ok && m.fit) done(() => pending.resolve(m.fit!), true);
      else if (m.message) done(() => pending.reject(badRequest(m.message!)), true);
      else done(() => pending.reject(new Error(`the fit worker failed: ${m.fault ?? "no reason given"}`)), false);
    };
    const onError = (err: Error) => done(() => pending.reject(new Error(`the fit worker failed: ${err.message}`)), false);
    worker.on("message", onMessage);
    worker.once("error", onError);
    worker.postMessage({ id: pending.id, job: pending.job });
  });
}

function dispatch(): void {
  while (queue.length) {
    let entry = workers.find((w) => !w.busy);
    if (!entry && workers.length < fitPoolSize()) entry = start();
    if (!entry) return;
    const pending = queue.shift()!;
    void runOn(entry, pending).then(dispatch);
  }
}

/** Fits one job on a pool thread; input the fitter refuses rejects with a 400 naming the field. */
export function fitInPool(job: FitJob): Promise<ModelFitResult> {
  return new Promise<ModelFitResult>((resolve, reject) => {
    queue.push({ id: nextId++, job, resolve, reject });
    dispatch();
  });
}

/** Ends every worker (tests, shutdown). */
export async function closeFitPool(): Promise<void> {
  queue.splice(0).forEach((p) => p.reject(new Error("the fit pool was closed")));
  await Promise.all(workers.splice(0).map((w) => w.worker.terminate()));
}
