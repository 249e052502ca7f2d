import "server-only";
import { createHash } from "node:crypto";
import fs from "node:fs";
import fsp from "node:fs/promises";
import path from "node:path";
import { pipeline } from "node:stream/promises";
import { createClient } from "@libsql/client";
import { drizzle } from "drizzle-orm/libsql";
import { getClient } from "@/db/client";
import * as schema from "@/db/schema";
import { env } from "@/lib/env";
import { verifyAuditChain } from "../audit";
import { blobStore } from "../storage/store";

export const MANIFEST = "manifest.json";
const DATABASE_FILE = "prooflight.db";

export interface BackupManifest {
  format: "prooflight-backup/1";
  createdAt: string;
  database: { file: string; bytes: number; sha256: string };
  /** Every stored upload a version names, by its content hash (files live under blobs/ab/cd/<sha256>). */
  blobs: Array<{ sha256: string; bytes: number }>;
  audit: { entries: number };
}

/** SHA-256 and size of a file, streamed (memory does not grow with the file). */
export async function hashFile(file: string): Promise<{ sha256: string; bytes: number }> {
  const hash = createHash("sha256");
  let bytes = 0;
  for await (const chunk of fs.createReadStream(file)) {
    hash.update(chunk as Buffer);
    bytes += (chunk as Buffer).length;
  }
  return { sha256: hash.digest("hex"), bytes };
}

export const blobInBackup = (dir: string, sha256: string) => path.join(dir, "blobs", sha256.slice(0, 2), sha256.slice(2, 4), sha256);

/** Opens a database file on its own (not the process-wide one) for reading what a snapshot holds. */
export function openDatabaseFile(file: string) {
  const client = createClient({ url: `file:${file}` });
  return { client, db: drizzle(client, { schema }) };
}

function assertEmptyDir(dir: string, what: string) {
  if (fs.existsSync(dir) && fs.readdirSync(dir).length) throw new Error(`${what} ${dir} is not empty: choose a new or empty folder.`);
}

/**
 * A consistent snapshot while the app keeps writing: `VACUUM INTO` copies the database as one
 * read transaction sees it, then every upload the snapshot's versions name is copied (uploads are
 * content-addressed and immutable, and stored before their version row, so all are there) and
 * re-hashed against its name. A manifest lists the database and every file with its SHA-256.
 */
export async function createBackup(dir: string): Promise<BackupManifest> {
  assertEmptyDir(dir, "The backup folder");
  await fsp.mkdir(dir, { recursive: true });
  const dbFile = path.join(dir, DATABASE_FILE);
  await getClient().execute({ sql: "VACUUM INTO ?", args: [dbFile] });
  const snapshot = openDatabaseFile(dbFile);
  try {
    const hashes = (await snapshot.db.selectDistinct({ sha256: schema.versions.sha256 }).from(schema.versions).orderBy(schema.versions.sha256)).map(
      (r) => r.sha256,
    );
    const blobs: BackupManifest["blobs"] = [];
    for (const sha256 of hashes) {
      const dest = blobInBackup(dir, sha256);
      await fsp.mkdir(path.dirname(dest), { recursive: true });
      await pipeline(await blobStore().openRead(sha256), fs.createWriteStream(dest));
      const copied = await hashFile(dest);
      if (copied.sha256 !== sha256) throw new Error(`The stored upload ${sha256} does not match its hash (${copied.sha256}): the store is damaged.`);
      blobs.push(copied);
    }
    const audit = await verifyAuditChain(snapshot.db);
    if (!audit.ok) throw new Error(`The audit log is broken at entry ${audit.seq}: ${audit.reason}.`);
    const manifest: BackupManifest = {
      format: "prooflight-backup/1",
      createdAt: new Date().toISOString(),
      database: { file: DATABASE_FILE, ...(await hashFile(dbFile)) },
      blobs,
      audit: { entries: audit.count },
    };
    await fsp.writeFile(path.join(dir, MANIFEST), `${JSON.stringify(manifest, null, 2)}\n`);
    return manifest;
  } finally {
    snapshot.client.close();
  }
}

/** Where `npm run restore` writes: the configured database file and uploads folder. */
export function restoreTarget() {
  const url = env().databaseUrl;
  if (!url.startsWith("file:")) throw new Error(`DATABASE_URL ${url} is not a local file: restore a backup into a file, then load it into the server.`);
  return { databaseFile: path.resolve(url.slice("file:".length)), uploadsDir: path.resolve(env().uploadsDir) };
}
