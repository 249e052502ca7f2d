import path from "node:path";
import { ensureLocalEnv } from "./lib/local-env";
ensureLocalEnv();

const dir = process.argv[2];
if (!dir || process.argv.length !== 3) {
  console.error("Usage: npm run restore -- <backup folder>   (into DATABASE_URL and UPLOADS_DIR, which must be empty)");
  process.exit(2);
}
const { restoreBackup } = await import("@/lib/server/backup/restore");
const { restoreTarget } = await import("@/lib/server/backup/backup");
try {
  const target = restoreTarget();
  const checks = await restoreBackup(path.resolve(dir), target);
  const failed = checks.filter((c) => !c.ok);
  for (const c of failed.length ? failed : checks.slice(-1)) console.log(`${c.ok ? "ok  " : "FAIL"}  ${c.item}  ${c.check}  ${c.detail}`);
  console.log(`${checks.length} checks, ${failed.length} failed. Restored into ${target.databaseFile} and ${target.uploadsDir}.`);
  if (failed.length) process.exitCode = 1;
} catch (err) {
  console.error(`Restore failed: ${(err as Error).message}`);
  process.exitCode = 1;
}
