// `npm run sweep [-- --dry-run]`: removes stored files no dataset version references, older than
// ORPHAN_GRACE_MS (1 h by default); --dry-run lists them and removes nothing.
import { ensureLocalEnv } from "./lib/local-env";
ensureLocalEnv();

const dryRun = process.argv.includes("--dry-run");
const { closeDb } = await import("@/db/client");
const { sweepOrphanBlobs } = await import("@/lib/server/storage/orphan-sweep");
const report = await sweepOrphanBlobs({ dryRun });
closeDb();
const bytes = report.removed.reduce((sum, r) => sum + r.bytes, 0);
console.log(
  `${dryRun ? "Would remove" : "Removed"} ${report.removed.length} unreferenced file${report.removed.length === 1 ? "" : "s"} (${bytes} bytes); kept ${report.kept} referenced, spared ${report.spared} inside the grace period.`,
);
