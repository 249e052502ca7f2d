import "server-only";
import { createHash } from "node:crypto";
import fs from "node:fs";
import { once } from "node:events";
import { Zip, ZipDeflate } from "fflate";
import { removeTemp, tempPath } from "../storage/blob-store";

/** Every entry is deflated in blocks of this size, whatever the source's chunks, so the archive's bytes repeat. */
const BLOCK = 1 << 20;
/** A fixed date on every entry (the bytes of an archive never depend on when it was written). */
const MTIME = new Date("2000-01-01T00:00:00Z");

export interface WrittenEntry {
  sha256: string;
  byteSize: number;
}

/**
 * A zip archive written to a temporary file one entry at a time, deflating as the bytes come
 * (fflate's streaming Zip), so an archive of a million-row figure never sits in memory. Each entry
 * is hashed on the way in. The temporary file lives under uploads/tmp: a crash leaves it to the
 * start-up sweep.
 */
export class ZipFileWriter {
  readonly path = tempPath();
  private readonly out = fs.createWriteStream(this.path, { flags: "wx" });
  private readonly zip: Zip;
  private failure: Error | null = null;
  private finished: Promise<void>;
  private resolveFinished!: () => void;

  constructor() {
    this.finished = new Promise((resolve) => (this.resolveFinished = resolve));
    this.out.on("error", (err) => (this.failure ??= err));
    this.zip = new Zip((err, data, final) => {
      if (err) this.failure ??= err;
      else this.out.write(data);
      if (final) this.resolveFinished();
    });
  }

  /** Adds one entry from its bytes, or from chunks produced on demand. */
  async add(name: string, source: Uint8Array | Iterable<Uint8Array> | AsyncIterable<Uint8Array>): Promise<WrittenEntry> {
    const entry = new ZipDeflate(name, { level: 6 });
    entry.mtime = MTIME;
    this.zip.add(entry);
    const hash = createHash("sha256");
    let byteSize = 0;
    let block = new Uint8Array(BLOCK);
    let filled = 0;
    const push = async (final: boolean) => {
      entry.push(block.subarray(0, filled), final);
      block = new Uint8Array(BLOCK);
      filled = 0;
      this.check();
      if (this.out.writableNeedDrain) await once(this.out, "drain");
    };
    for await (const chunk of source instanceof Uint8Array ? [source] : source) {
      hash.update(chunk);
      byteSize += chunk.byteLength;
      for (let at = 0; at < chunk.byteLength;) {
        const n = Math.min(BLOCK - filled, chunk.byteLength - at);
        block.set(chunk.subarray(at, at + n), filled);
        filled += n;
        at += n;
        if (filled === BLOCK) await push(false);
      }
    }
    await push(true);
    return { sha256: hash.digest("hex"), byteSize };
  }

  /** Writes the central directory and closes the file; returns its size in bytes. */
  async finish(): Promise<number> {
    this.zip.end();
    await this.finished;
    this.check();
    await new Promise<void>((resolve, reject) => this.out.end((err?: Error | null) => (err ? reject(err) : resolve())));
    return (await fs.promises.stat(this.path)).size;
  }

  /** Gives up: closes and removes the temporary file. */
  async discard(): Promise<void> {
    if (!this.out.closed) {
      await new Promise<void>((resolve) => {
        this.out.once("close", () => resolve());
        this.out.destroy();
      });
    }
    await removeTemp(this.path);
  }

  private check(): void {
    if (this.failure) throw this.failure;
  }
}
