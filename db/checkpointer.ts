import "server-only";
import path from "node:path";
import { Worker } from "node:worker_threads";
import { setConnectionPragmas } from "./statement-cache";

const INTERVAL_MS = 250;
/**
 * How far a connection of this process lets the log grow before its own commit checkpoints:
 * a safety net (40 MB) should the checkpointer fall behind; SQLite's default is 1,000 pages.
 */
const SAFETY_NET_PAGES = 10_000;

export type CheckpointReport = { type: "checkpoint"; log: number; checkpointed: number } | { type: "error"; message: string };

/**
 * Starts the checkpointer for a `file:` database (other URLs checkpoint on their server) and
 * raises this process's connections' own threshold to the safety net. Each instance may run one:
 * a checkpoint that finds another under way does nothing.
 */
export function startCheckpointer(databaseUrl: string, onReport?: (r: CheckpointReport) => void): Worker | null {
  if (!databaseUrl.startsWith("file:")) return null;
  setConnectionPragmas([`PRAGMA wal_autocheckpoint=${SAFETY_NET_PAGES}`]);
  const worker = new Worker(path.join(/* turbopackIgnore: true */ process.cwd(), "db", "checkpoint-worker.mjs"), {
    workerData: { path: path.resolve(databaseUrl.slice("file:".length)), intervalMs: INTERVAL_MS },
  });
  worker.unref();
  worker.on("message", (r: CheckpointReport) => {
    if (r.type === "error") console.warn(`[prooflight] checkpoint failed: ${r.message}`);
    onReport?.(r);
  });
  worker.on("error", (err) => console.warn(`[prooflight] the checkpointer stopped (commits checkpoint past ${SAFETY_NET_PAGES} pages): ${err.message}`));
  return worker;
}
