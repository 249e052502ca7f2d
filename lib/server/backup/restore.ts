import "server-only";
import fs from "node:fs";
import fsp from "node:fs/promises";
import path from "node:path";
import { versions } from "@/db/schema";
import { verifyAuditChain } from "../audit";
import { blobInBackup, hashFile, MANIFEST, openDatabaseFile, type BackupManifest } from "./backup";

export interface RestoreCheck {
  item: string;
  check: string;
  ok: boolean;
  detail: string;
}

async function readManifest(dir: string): Promise<BackupManifest> {
  const file = path.join(dir, MANIFEST);
  if (!fs.existsSync(file)) throw new Error(`${file} is missing: ${dir} is not a Prooflight backup.`);
  const m = JSON.parse(await fsp.readFile(file, "utf8")) as BackupManifest;
  if (m.format !== "prooflight-backup/1") throw new Error(`${file}: unknown format "${String(m.format)}".`);
  return m;
}

/** Re-hashes the backup's database and every upload against the manifest, before anything is written. */
async function checkBackup(dir: string, m: BackupManifest): Promise<RestoreCheck[]> {
  const checks: RestoreCheck[] = [];
  const db = await hashFile(path.join(dir, m.database.file)).catch(() => null);
  checks.push({ item: m.database.file, check: "SHA-256", ok: db?.sha256 === m.database.sha256, detail: db ? db.sha256.slice(0, 12) : "missing" });
  for (const b of m.blobs) {
    const got = await hashFile(blobInBackup(dir, b.sha256)).catch(() => null);
    checks.push({ item: `upload ${b.sha256.slice(0, 12)}`, check: "SHA-256", ok: got?.sha256 === b.sha256, detail: got ? got.sha256.slice(0, 12) : "missing" });
  }
  return checks;
}

/**
 * Restores a backup into an empty location: checks every hash first (a damaged backup writes
 * nothing), copies the database and the uploads, then re-checks the restored copy — every
 * upload a version names is present with its hash, and the audit chain is intact.
 */
export async function restoreBackup(dir: string, target: { databaseFile: string; uploadsDir: string }): Promise<RestoreCheck[]> {
  if (fs.existsSync(target.databaseFile)) throw new Error(`${target.databaseFile} exists: restore only into an empty location.`);
  if (fs.existsSync(target.uploadsDir) && fs.readdirSync(target.uploadsDir).length)
    throw new Error(`${target.uploadsDir} is not empty: restore only into an empty location.`);
  const m = await readManifest(dir);
  const before = await checkBackup(dir, m);
  const bad = before.filter((c) => !c.ok);
  if (bad.length) throw new Error(`The backup is damaged; nothing was restored: ${bad.map((c) => `${c.item} (${c.detail})`).join(", ")}.`);

  await fsp.mkdir(path.dirname(target.databaseFile), { recursive: true });
  await fsp.copyFile(path.join(dir, m.database.file), target.databaseFile, fs.constants.COPYFILE_EXCL);
  for (const b of m.blobs) {
    const dest = path.join(target.uploadsDir, b.sha256.slice(0, 2), b.sha256.slice(2, 4), b.sha256);
    await fsp.mkdir(path.dirname(dest), { recursive: true });
    await fsp.copyFile(blobInBackup(dir, b.sha256), dest, fs.constants.COPYFILE_EXCL);
    await fsp.chmod(dest, 0o444);
  }

  const after: RestoreCheck[] = [];
  const restored = openDatabaseFile(target.databaseFile);
  try {
    const hashes = (await restored.db.selectDistinct({ sha256: versions.sha256 }).from(versions)).map((r) => r.sha256);
    for (const sha256 of hashes) {
      const file = path.join(target.uploadsDir, sha256.slice(0, 2), sha256.slice(2, 4), sha256);
      const got = await hashFile(file).catch(() => null);
      after.push({
        item: `restored upload ${sha256.slice(0, 12)}`,
        check: "present, SHA-256",
        ok: got?.sha256 === sha256,
        detail: got ? "matches" : "missing",
      });
    }
    const audit = await verifyAuditChain(restored.db);
    after.push({
      item: "audit log",
      check: "hash chain",
      ok: audit.ok && audit.count === m.audit.entries,
      detail: audit.ok ? `${audit.count} entries` : `broken at ${audit.seq}: ${audit.reason}`,
    });
  } finally {
    restored.client.close();
  }
  return [...before, ...after];
}
