// A worker thread that copies the write-ahead log into the database file (a PASSIVE checkpoint,
// which never blocks readers or writers) every few hundred milliseconds, on its own connection.
// Otherwise the commit that fills the log past SQLite's threshold does it, on the server's main
// thread, and every request waits meanwhile. Plain JavaScript: it needs no loader.
import { parentPort, workerData } from "node:worker_threads";
import Database from "libsql";

const db = new Database(workerData.path);
const checkpoint = db.prepare("PRAGMA wal_checkpoint(PASSIVE)");
const timer = setInterval(() => {
  try {
    const [row] = checkpoint.all();
    // Only when there was something to copy: an idle server sends nothing.
    if (row && row.log > 0) parentPort.postMessage({ type: "checkpoint", log: row.log, checkpointed: row.checkpointed });
  } catch (err) {
    parentPort.postMessage({ type: "error", message: err instanceof Error ? err.message : String(err) });
  }
}, workerData.intervalMs);

parentPort.on("message", (m) => {
  if (m !== "stop") return;
  clearInterval(timer);
  db.close();
  parentPort.close();
});
