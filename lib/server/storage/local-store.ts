import "server-only";
import fs from "node:fs";
import fsp from "node:fs/promises";
import path from "node:path";
import type { Readable } from "node:stream";
import { readFileBytes, removeTemp, writeStreamToTemp } from "./blob-store";
import { BlobMissingError, assertCacheName, blobKey, type BlobInfo, type BlobStore } from "./blob-contract";

const HEX2 = /^[0-9a-f]{2}$/;
const SHA256 = /^[0-9a-f]{64}$/;

/** Files under the uploads folder at `ab/cd/<sha256>`, read-only once stored (the layout every install has used). */
export class LocalBlobStore implements BlobStore {
  readonly kind = "local" as const;
  constructor(private readonly root: string) {}

  private file(sha256: string): string {
    return path.join(this.root, ...blobKey(sha256).split("/"));
  }

  /** fsync, then one atomic rename; when the file is already there the copy is dropped and its time refreshed. */
  async putFile(tmp: string, sha256: string): Promise<{ created: boolean }> {
    const dest = this.file(sha256);
    try {
      if (fs.existsSync(dest)) {
        const now = new Date();
        await fsp.utimes(dest, now, now);
        return { created: false };
      }
      await fsp.mkdir(path.dirname(dest), { recursive: true });
      const fh = await fsp.open(tmp, "r");
      await fh.sync();
      await fh.close();
      await fsp.rename(tmp, dest);
      await fsp.chmod(dest, 0o444);
      return { created: true };
    } finally {
      await removeTemp(tmp);
    }
  }

  async putStream(source: AsyncIterable<Uint8Array> | Iterable<Uint8Array>, sha256: string): Promise<{ created: boolean }> {
    return this.putFile(await checkedTemp(source, sha256), sha256);
  }

  async openRead(sha256: string): Promise<Readable> {
    const file = this.file(sha256);
    const stream = fs.createReadStream(file);
    // Opening fails asynchronously: wait for it, so a missing file is an error here and not mid-response.
    await new Promise<void>((resolve, reject) => {
      stream.once("open", () => resolve());
      stream.once("error", (err: NodeJS.ErrnoException) => reject(err.code === "ENOENT" ? new BlobMissingError(sha256) : err));
    });
    return stream;
  }

  async readAll(sha256: string): Promise<Uint8Array> {
    try {
      return await readFileBytes(this.file(sha256));
    } catch (err) {
      if ((err as NodeJS.ErrnoException).code === "ENOENT") throw new BlobMissingError(sha256);
      throw err;
    }
  }

  async stat(sha256: string): Promise<BlobInfo | null> {
    const st = await fsp.stat(this.file(sha256)).catch((err: NodeJS.ErrnoException) => {
      if (err.code === "ENOENT") return null;
      throw err;
    });
    return st?.isFile() ? { sha256, size: st.size, lastModified: st.mtime } : null;
  }

  async exists(sha256: string): Promise<boolean> {
    return (await this.stat(sha256)) !== null;
  }

  /** Walks `ab/cd/`; `tmp/`, `cache/` and anything not named by its hash are not stored files. */
  async *list(): AsyncIterable<BlobInfo> {
    for (const a of await dirNames(this.root)) {
      if (!HEX2.test(a)) continue;
      for (const b of await dirNames(path.join(this.root, a))) {
        if (!HEX2.test(b)) continue;
        for (const name of await dirNames(path.join(this.root, a, b))) {
          if (!SHA256.test(name) || !name.startsWith(a + b)) continue;
          const info = await this.stat(name);
          if (info) yield info;
        }
      }
    }
  }

  async delete(sha256: string): Promise<void> {
    await fsp.rm(this.file(sha256), { force: true });
  }

  async withLocalFile<T>(sha256: string, work: (file: string) => Promise<T>): Promise<T> {
    if (!(await this.exists(sha256))) throw new BlobMissingError(sha256);
    return work(this.file(sha256));
  }

  /** One atomic rename into `uploads/cache/<name>` (the part file lives under uploads/tmp, on the same disk). */
  async putCache(name: string, tmp: string): Promise<void> {
    assertCacheName(name);
    const dest = path.join(this.root, "cache", ...name.split("/"));
    try {
      await fsp.mkdir(path.dirname(dest), { recursive: true });
      await fsp.rename(tmp, dest);
    } finally {
      await removeTemp(tmp);
    }
  }

  async readCache(name: string): Promise<Uint8Array | null> {
    assertCacheName(name);
    try {
      return await readFileBytes(path.join(this.root, "cache", ...name.split("/")));
    } catch (err) {
      if ((err as NodeJS.ErrnoException).code === "ENOENT") return null;
      throw err;
    }
  }
}

async function dirNames(dir: string): Promise<string[]> {
  try {
    return (await fsp.readdir(dir)).sort();
  } catch (err) {
    if ((err as NodeJS.ErrnoException).code === "ENOENT") return [];
    throw err;
  }
}

/** Streams into a temporary file and checks the hash; on a mismatch the file is removed and nothing is stored. */
export async function checkedTemp(source: AsyncIterable<Uint8Array> | Iterable<Uint8Array>, sha256: string): Promise<string> {
  blobKey(sha256);
  const written = await writeStreamToTemp(source, Number.MAX_SAFE_INTEGER);
  if (written.sha256 !== sha256) {
    await removeTemp(written.tmp);
    throw new Error(`the bytes hash to ${written.sha256}, not ${sha256}: nothing was stored`);
  }
  return written.tmp;
}
