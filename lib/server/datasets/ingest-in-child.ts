/**
 * Uploads are parsed under a budget, outside the server process: each file is read, parsed,
 * summarised and encoded by the ingest child (ingest-worker/ingest-child.ts, child_process.fork
 * with IPC), which writes the columnar cache to a part file itself and sends back only the table's
 * description (columns, row count, parse info, summaries). The server's memory therefore stays
 * flat however large the file; the child's heap is capped with --max-old-space-size
 * (INGEST_HEAP_MB) and a job is killed at its wall-clock budget (INGEST_TIMEOUT_MS).
 *
 * - A parse error comes back as the same ParseError (file, line, column) → 400/415/422.
 * - A file that needs more memory than the budget → 413 `ingest_memory_budget`; one that takes
 *   longer than the budget → 422 `ingest_time_budget`. The server is untouched either way.
 * - A child that cannot start or dies otherwise is a fault of ours → 500.
 *
 * A process, not a worker thread, for the reason the renderer gives (render-in-worker.ts): V8 may
 * abort the whole process when a worker thread runs out of heap. The child runs the TypeScript
 * parsing layer through tsx (a dependency), started from process.cwd() with an empty environment;
 * `next start` runs from the project root, so lib/ and node_modules/tsx are there (a standalone
 * output would need lib/server/datasets/ingest-worker, lib/data and tsx copied alongside).
 *
 * Warm children are reused (each collects its garbage after a job); one that timed out, crashed
 * or ran out of memory is discarded.
 */
import "server-only";
import { fork, type ChildProcess } from "node:child_process";
import path from "node:path";
import { ParseError } from "@/lib/data/parse";
import { env } from "@/lib/env";
import { AppError } from "@/lib/errors";
import type { IngestedTable, IngestFailure, IngestJob } from "./ingest-worker/ingest-core";

export type { IngestedTable, IngestJob } from "./ingest-worker/ingest-core";

/** tsx compiles the parsing layer on the child's first start; a loaded machine can take seconds. */
const STARTUP_TIMEOUT_MS = 60_000;
const MAX_IDLE_CHILDREN = 2;
const JOBS_PER_CHILD = 200;
/** An idle child is stopped after this long without work. */
const IDLE_MS = 60_000;

function childPath(root: string): string {
  return path.join(/* turbopackIgnore: true */ root, "lib", "server", "datasets", "ingest-worker", "ingest-child.ts");
}

interface PooledChild {
  child: ChildProcess;
  heapMb: number;
  jobs: number;
  ready: Promise<void>;
  /** The tail of the child's stderr: tells an out-of-memory abort from other crashes. */
  stderr: string;
  idleTimer?: ReturnType<typeof setTimeout>;
}

type Reply = { type?: string; id?: number; ok?: boolean; table?: IngestedTable; error?: IngestFailure };

const idle: PooledChild[] = [];
let nextId = 1;

function memoryBudgetError(fileName: string, heapMb: number): AppError {
  return new AppError(
    413,
    "ingest_memory_budget",
    `${fileName}: reading this file needs more memory than one upload may use (${heapMb} MB). Split it into smaller files, or ask the administrator to raise INGEST_HEAP_MB.`,
  );
}

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

function outOfMemory(c: PooledChild): boolean {
  return /heap out of memory|Allocation failed|Reached heap limit/i.test(c.stderr);
}

function exitError(c: PooledChild, fileName: string, code: number | null, signal: NodeJS.Signals | null): Error {
  if (outOfMemory(c)) return memoryBudgetError(fileName, c.heapMb);
  return new Error(`the ingest child exited (${signal ?? code})${c.stderr ? `: ${c.stderr.slice(-500)}` : ""}`);
}

function spawn(heapMb: number): PooledChild {
  const root = process.cwd();
  // execArgv is set in full: fork would otherwise pass on the parent's flags (Next's, Vitest's).
  const child = fork(childPath(root), [], {
    cwd: root,
    execArgv: ["--conditions=react-server", "--import", "tsx", `--max-old-space-size=${heapMb}`, "--expose-gc"],
    env: { NODE_ENV: "production" },
    stdio: ["ignore", "ignore", "pipe", "ipc"],
  });
  const pooled: PooledChild = { child, heapMb, jobs: 0, ready: Promise.resolve(), stderr: "" };
  child.stderr?.on("data", (d: Buffer) => {
    pooled.stderr = (pooled.stderr + d.toString("utf8")).slice(-4000);
  });
  pooled.ready = new Promise<void>((resolve, reject) => {
    const timer = setTimeout(() => reject(new Error("the ingest child did not start")), STARTUP_TIMEOUT_MS);
    const onMessage = (m: Reply) => {
      if (m?.type !== "ready") return;
      clearTimeout(timer);
      child.off("message", onMessage);
      resolve();
    };
    child.on("message", onMessage);
    child.once("error", (err) => {
      clearTimeout(timer);
      reject(new Error(`the ingest child failed: ${err.message}`));
    });
    child.once("exit", (code, signal) => {
      clearTimeout(timer);
      reject(exitError(pooled, "the file", code, signal));
    });
  });
  pooled.ready.catch(() => undefined); // observed by the job that awaits it
  child.once("exit", () => {
    const i = idle.indexOf(pooled);
    if (i >= 0) idle.splice(i, 1);
  });
  return pooled;
}

function acquire(heapMb: number): PooledChild {
  const i = idle.findIndex((c) => c.heapMb === heapMb);
  if (i < 0) return spawn(heapMb);
  const c = idle.splice(i, 1)[0];
  clearTimeout(c.idleTimer);
  return c;
}

function release(c: PooledChild): void {
  if (c.jobs < JOBS_PER_CHILD && idle.length < MAX_IDLE_CHILDREN && c.child.connected) {
    setRef(c.child, false); // an idle child must not keep the server (or a test run, or a script) alive
    c.idleTimer = setTimeout(() => {
      const i = idle.indexOf(c);
      if (i >= 0) idle.splice(i, 1);
      c.child.kill("SIGKILL");
    }, IDLE_MS);
    c.idleTimer.unref();
    idle.push(c);
  } else {
    c.child.kill("SIGKILL");
  }
}

function killAndWait(child: ChildProcess): Promise<void> {
  return new Promise<void>((resolve) => {
    if (child.exitCode !== null || child.signalCode !== null) return resolve();
    child.once("exit", () => resolve());
    child.kill("SIGKILL");
  });
}

function failureError(f: IngestFailure | undefined, fileName: string, heapMb: number): Error {
  if (f?.kind === "parse") {
    return new ParseError(f.code, f.message, f.fileName, { line: f.line, column: f.column, columnName: f.columnName });
  }
  if (f?.kind === "memory") return memoryBudgetError(fileName, heapMb);
  return new Error(`the ingest child could not read ${fileName}: ${f?.message ?? "no reason given"}`);
}

/**
 * Parses `job.input` in a budgeted child, which writes the columnar cache to `job.output` (a path
 * that must not exist yet). Resolves with the table's description once the cache file is complete;
 * on any failure nothing is left at `job.output`.
 */
export async function ingestInChild(job: IngestJob): Promise<IngestedTable> {
  const { ingestHeapMb: heapMb, ingestTimeoutMs: timeoutMs } = env();
  const pooled = acquire(heapMb);
  const { child } = pooled;
  setRef(child, true);
  try {
    await pooled.ready;
  } catch (err) {
    child.kill("SIGKILL");
    throw err instanceof AppError ? memoryBudgetError(job.fileName, heapMb) : err;
  }
  pooled.jobs++;
  const id = nextId++;
  return new Promise<IngestedTable>((resolve, reject) => {
    let settled = false;
    const finish = (fn: () => void, keep: boolean) => {
      if (settled) return;
      settled = true;
      clearTimeout(timer);
      child.off("message", onMessage);
      child.off("exit", onExit);
      if (keep) {
        release(pooled);
        fn();
      } else {
        // Settle once the child is gone, so the caller's clean-up cannot race a write of the child's.
        void killAndWait(child).then(fn);
      }
    };
    const onMessage = (m: Reply) => {
      if (m?.id !== id) return;
      if (m.ok && m.table) finish(() => resolve(m.table!), true);
      else finish(() => reject(failureError(m.error, job.fileName, heapMb)), m.error?.kind === "parse");
    };
    const onExit = (code: number | null, signal: NodeJS.Signals | null) => finish(() => reject(exitError(pooled, job.fileName, code, signal)), false);
    const timer = setTimeout(
      () =>
        finish(
          () =>
            reject(
              new AppError(
                422,
                "ingest_time_budget",
                `${job.fileName}: reading this file took longer than one upload may take (${Math.round(timeoutMs / 1000)} s). Split it into smaller files, or ask the administrator to raise INGEST_TIMEOUT_MS.`,
              ),
            ),
          false,
        ),
      timeoutMs,
    );
    child.on("message", onMessage);
    child.once("exit", onExit);
    child.send({ id, job }, (err) => {
      if (err) finish(() => reject(new Error(`the ingest job could not be sent: ${err.message}`)), false);
    });
  });
}
