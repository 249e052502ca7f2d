import "server-only";
import type { BlobStore } from "./blob-contract";

interface CopyReport {
  copied: number;
  /** Already in the target with the same size (a rerun after an interruption skips them). */
  present: number;
  /** Files whose bytes no longer match their name, with the reason: not copied. */
  failed: Array<{ sha256: string; reason: string }>;
}

/**
 * Copies every stored file from one store into another (moving an install's uploads folder into a
 * bucket): each is streamed and re-hashed on the way, so a damaged file is reported, never copied.
 * Safe to run again: what is already there is skipped.
 */
export async function copyBlobs(from: BlobStore, to: BlobStore, onFile?: (sha256: string) => void): Promise<CopyReport> {
  const report: CopyReport = { copied: 0, present: 0, failed: [] };
  for await (const b of from.list()) {
    const there = await to.stat(b.sha256);
    if (there && there.size === b.size) {
      report.present++;
      continue;
    }
    try {
      await to.putStream(await from.openRead(b.sha256), b.sha256);
      report.copied++;
      onFile?.(b.sha256);
    } catch (err) {
      report.failed.push({ sha256: b.sha256, reason: (err as Error).message });
    }
  }
  return report;
}
