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
import path from "node:path";
import { ChildPool, ranOutOfMemory, type PooledChild } from "../child-pool";
import { ParseError } from "@/lib/data/parse";
import { env } from "@/lib/env";
import { AppError } from "@/lib/errors";
import type { IngestedTable, IngestFailure, IngestJob } from "./ingest-worker/ingest-core";

export type { IngestedTable, IngestJob } from "./ingest-worker/ingest-core";

const pool = new ChildPool({
  script: () => path.join(/* turbopackIgnore: true */ process.cwd(), "lib", "server", "datasets", "ingest-worker", "ingest-child.ts"),
  execArgv: (heapMb) => ["--conditions=react-server", "--import", "tsx", `--max-old-space-size=${heapMb}`, "--expose-gc"],
  // tsx compiles the parsing layer on the child's first start; a loaded machine can take seconds.
  startupTimeoutMs: 60_000,
  maxIdle: 2,
  jobsPerChild: 200,
  idleMs: 60_000,
});

type Reply = { id?: number; ok?: boolean; table?: IngestedTable; error?: IngestFailure };

function memoryBudgetError(fileName: string, heapMb: number): AppError {
  return new AppError(
    413,
    "ingest_memory_budget",
    `${fileName}: reading this file needs more memory than one upload may use (${heapMb} MB). Split it into smaller files, or ask the administrator to raise INGEST_HEAP_MB.`,
  );
}

function crashError(c: PooledChild, fileName: string, how: string): Error {
  if (ranOutOfMemory(c)) return memoryBudgetError(fileName, c.heapMb);
  return new Error(`the ingest child ${how}${c.stderr ? `: ${c.stderr.slice(-500)}` : ""}`);
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
export function ingestInChild(job: IngestJob): Promise<IngestedTable> {
  const { ingestHeapMb: heapMb, ingestTimeoutMs: timeoutMs } = env();
  return pool.run<IngestedTable, Reply>({ job }, heapMb, timeoutMs, {
    reply: (m) => (m.ok && m.table ? { value: m.table } : { error: failureError(m.error, job.fileName, heapMb), keep: m.error?.kind === "parse" }),
    notStarted: (c, reason) => crashError(c, job.fileName, `did not start: ${reason.message}`),
    exited: (c, code, signal) => crashError(c, job.fileName, `exited (${signal ?? code})`),
    timedOut: () =>
      new AppError(
        422,
        "ingest_time_budget",
        `${job.fileName}: reading this file took longer than one upload may take (${Math.round(timeoutMs / 1000)} s). Split it into smaller files, or ask the administrator to raise INGEST_TIMEOUT_MS.`,
      ),
  });
}
