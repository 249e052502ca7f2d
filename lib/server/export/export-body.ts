import "server-only";
import fs from "node:fs";
import { Readable } from "node:stream";
import { readFileBytes, removeTemp } from "../storage/blob-store";

/**
 * What an export hands back: bytes in memory (a figure file) or a temporary file (source data and
 * bundles, written as they were made), removed once it has been read or its reader went away.
 */
export class ExportBody {
  private constructor(
    private readonly held: Uint8Array | null,
    private readonly file: string | null,
    readonly byteLength: number,
  ) {}

  static ofBytes(bytes: Uint8Array): ExportBody {
    return new ExportBody(bytes, null, bytes.byteLength);
  }

  static ofTempFile(file: string, byteLength: number): ExportBody {
    return new ExportBody(null, file, byteLength);
  }

  /**
   * The body of an HTTP answer. A temporary file is opened and removed at once: the open handle keeps
   * its bytes readable to the end of the download, and nothing is left on disk whatever becomes of it.
   */
  async toResponseBody(): Promise<BodyInit> {
    if (this.held) return this.held as BodyInit;
    const handle = await fs.promises.open(this.file!, "r");
    await removeTemp(this.file!);
    return Readable.toWeb(handle.createReadStream()) as ReadableStream<Uint8Array>;
  }

  /** The whole body in memory (tests, benches); a temporary file is removed. */
  async bytes(): Promise<Uint8Array> {
    if (this.held) return this.held;
    try {
      return await readFileBytes(this.file!);
    } finally {
      await removeTemp(this.file!);
    }
  }

  /** Drops the body unread (the export failed after writing it). */
  async discard(): Promise<void> {
    if (this.file) await removeTemp(this.file);
  }
}
