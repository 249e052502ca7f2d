/**
 * Ingest child: a Node process (child_process.fork with IPC) that parses and encodes uploads for
 * ../ingest-in-child.ts, so a large file never sits in the server's memory and a file that needs
 * more than the heap budget (--max-old-space-size) ends this process, not the server.
 * Started with `--conditions=react-server --import tsx` from process.cwd(), so it runs the
 * TypeScript parsing layer (lib/data) as it is; the file system is its only input and output.
 *
 * Messages in:  { id, job: IngestJob }
 * Messages out: { type: "ready" } once, then { id, ok: true, table, workMs } | { id, ok: false, error, workMs }
 */
import "server-only";
import { runIngestJob, type IngestJob } from "./ingest-core";

const collectGarbage = (globalThis as { gc?: () => void }).gc;

if (typeof process.send !== "function") {
  console.error("ingest-child.ts runs as a forked child process with an IPC channel");
  process.exit(2);
}
const send = process.send.bind(process);

process.on("message", (m: { id: number; job: IngestJob }) => {
  const t0 = performance.now();
  const reply = runIngestJob(m.job);
  send({ id: m.id, ...reply, workMs: performance.now() - t0 });
  // Hand the file's memory back before waiting for the next job (started with --expose-gc).
  collectGarbage?.();
});
process.on("disconnect", () => process.exit(0));
send({ type: "ready" });
