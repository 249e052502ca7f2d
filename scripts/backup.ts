import path from "node:path";
import { ensureLocalEnv } from "./lib/local-env";
ensureLocalEnv();

const dir = process.argv[2];
if (!dir || process.argv.length !== 3) {
  console.error("Usage: npm run backup -- <empty folder>   (a consistent snapshot while the app keeps running)");
  process.exit(2);
}
const { closeDb } = await import("@/db/client");
const { createBackup } = await import("@/lib/server/backup/backup");
try {
  const m = await createBackup(path.resolve(dir));
  const bytes = m.blobs.reduce((n, b) => n + b.bytes, 0);
  console.log(
    `Backup in ${path.resolve(dir)}: database ${(m.database.bytes / 1e6).toFixed(1)} MB, ${m.blobs.length} uploads (${(bytes / 1e6).toFixed(1)} MB), ${m.audit.entries} audit entries; every file hashed into manifest.json.`,
  );
} catch (err) {
  console.error(`Backup failed: ${(err as Error).message}`);
  process.exitCode = 1;
} finally {
  closeDb();
}
