/**
 * The message loop of a fit worker thread: pure fitting, no database or files. Messages in:
 * { id, job: FitJob }; out: { type: "ready" } once, then { id, ok: true, fit } |
 * { id, ok: false, message } (input the fitter refuses) | { id, ok: false, fault } (a bug of ours).
 */
import "server-only";
import { parentPort } from "node:worker_threads";
import { runFitJob, type FitJob } from "../fit-job";

const port = parentPort;
if (!port) throw new Error("fit-worker-loop.ts runs in a worker thread");
port.on("message", (m: { id: number; job: FitJob }) => {
  try {
    port.postMessage({ id: m.id, ...runFitJob(m.job) });
  } catch (err) {
    port.postMessage({ id: m.id, ok: false, fault: (err as Error).stack ?? String(err) });
  }
});
port.postMessage({ type: "ready" });
