import "server-only";
import { createHash, randomBytes } from "node:crypto";
import { once } from "node:events";
import fs from "node:fs";
import fsp from "node:fs/promises";
import path from "node:path";
import { env } from "@/lib/env";

/** A fresh part file name under uploads/tmp (removed by the start-up sweep if a crash leaves it). */
export function tempPath(): string {
  const dir = path.join(env().uploadsDir, "tmp");
  fs.mkdirSync(dir, { recursive: true });
  return path.join(dir, `${Date.now()}-${randomBytes(8).toString("hex")}.part`);
}

export class TooLargeError extends Error {
  constructor(readonly limit: number) {
    super(`larger than ${limit} bytes`);
  }
}

/**
 * Streams into a temporary file while hashing; throws TooLargeError as soon as the limit is passed,
 * without reading further (leaving the loop destroys the source: the multipart reader then stops the
 * whole request). On any error the part file is removed before the promise settles.
 */
export async function writeStreamToTemp(
  source: AsyncIterable<Uint8Array> | Iterable<Uint8Array>,
  maxBytes: number,
): Promise<{ tmp: string; sha256: string; byteSize: number }> {
  const tmp = tempPath();
  const hash = createHash("sha256");
  const out = fs.createWriteStream(tmp, { flags: "wx" });
  let byteSize = 0;
  try {
    for await (const chunk of source) {
      byteSize += chunk.byteLength;
      if (byteSize > maxBytes) throw new TooLargeError(maxBytes);
      hash.update(chunk);
      // `once` rejects when the file stream errors, so a failing disk cannot leave this waiting for ever.
      if (!out.write(chunk)) await once(out, "drain");
    }
    await new Promise<void>((resolve, reject) => out.end((err?: Error | null) => (err ? reject(err) : resolve())));
    return { tmp, sha256: hash.digest("hex"), byteSize };
  } catch (err) {
    // The file may still be opening; remove it only once the stream has closed, or it reappears.
    await new Promise<void>((resolve) => {
      if (out.closed) return resolve();
      out.once("close", () => resolve());
      out.destroy();
    });
    await fsp.rm(tmp, { force: true });
    throw err;
  }
}

export async function removeTemp(tmp: string): Promise<void> {
  await fsp.rm(tmp, { force: true });
}

/**
 * Removes `uploads/tmp/*.part` files last written more than `olderThanMs` ago: left behind when the
 * process died mid-upload. A live upload writes its part file at least once per idle timeout (or is
 * aborted), so the default grace of twice the idle timeout never touches one. Call at start-up.
 */
export async function sweepUploadTemp(olderThanMs = 2 * env().uploadIdleTimeoutMs, now = Date.now()): Promise<{ removed: string[]; bytes: number }> {
  const dir = path.join(env().uploadsDir, "tmp");
  let names: string[];
  try {
    names = await fsp.readdir(dir);
  } catch (err) {
    if ((err as NodeJS.ErrnoException).code === "ENOENT") return { removed: [], bytes: 0 };
    throw err;
  }
  const removed: string[] = [];
  let bytes = 0;
  for (const name of names.filter((n) => n.endsWith(".part")).sort()) {
    const file = path.join(dir, name);
    const stat = await fsp.lstat(file).catch(() => null);
    if (!stat?.isFile() || now - stat.mtimeMs <= olderThanMs) continue;
    await fsp.rm(file, { force: true });
    removed.push(name);
    bytes += stat.size;
  }
  if (removed.length)
    console.info(`[prooflight] removed ${removed.length} abandoned upload part file${removed.length === 1 ? "" : "s"} (${bytes} bytes) from uploads/tmp`);
  return { removed, bytes };
}

/**
 * A plain Uint8Array view of a Buffer, without copying. Buffer#slice returns a view, not a copy,
 * so code written for Uint8Array (where slice copies) must never be handed a Buffer.
 */
function asBytes(buf: Buffer): Uint8Array {
  return new Uint8Array(buf.buffer, buf.byteOffset, buf.byteLength);
}

export async function readFileBytes(file: string): Promise<Uint8Array> {
  return asBytes(await fsp.readFile(file));
}
