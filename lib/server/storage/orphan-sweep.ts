import "server-only";
import { eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { versions } from "@/db/schema";
import { env } from "@/lib/env";
import { blobStore } from "./store";

export interface SweepReport {
  /** Stored files no version references, older than the grace period: removed (or, in a dry run, listed). */
  removed: Array<{ sha256: string; bytes: number; ageMinutes: number }>;
  /** Unreferenced files still inside the grace period (an upload may be about to reference them). */
  spared: number;
  kept: number;
  dryRun: boolean;
}

/**
 * Removes stored files that no dataset version references and that have not been put for longer than
 * the grace period (ORPHAN_GRACE_MS, 1 h by default). They are what a crash or a refused upload
 * leaves: an upload stores its file before the transaction that records its version, and deleting
 * an archived dataset for good leaves its files behind. The grace spares an upload in flight (its
 * file is younger than any upload may last), and putting stored bytes again refreshes their time.
 * Each removal is logged with its size and age. Parsed-column caches are rebuilt on demand and are
 * not swept here.
 */
export async function sweepOrphanBlobs(options: { graceMs?: number; dryRun?: boolean; now?: number } = {}): Promise<SweepReport> {
  const graceMs = options.graceMs ?? env().orphanGraceMs;
  const now = options.now ?? Date.now();
  const dryRun = options.dryRun ?? false;
  const referenced = new Set((await getDb().selectDistinct({ sha256: versions.sha256 }).from(versions)).map((r) => r.sha256));
  const report: SweepReport = { removed: [], spared: 0, kept: 0, dryRun };
  const store = blobStore();
  for await (const blob of store.list()) {
    if (referenced.has(blob.sha256)) {
      report.kept++;
      continue;
    }
    const age = now - blob.lastModified.getTime();
    if (age < graceMs) {
      report.spared++;
      continue;
    }
    // Checked again just before removing: a version may have been recorded since the list was read.
    const [again] = await getDb().select({ id: versions.id }).from(versions).where(eq(versions.sha256, blob.sha256)).limit(1);
    if (again) {
      report.kept++;
      continue;
    }
    if (!dryRun) await store.delete(blob.sha256);
    const entry = { sha256: blob.sha256, bytes: blob.size, ageMinutes: Math.round(age / 60_000) };
    report.removed.push(entry);
    console.info(
      `[prooflight] orphan sweep: ${dryRun ? "would remove" : "removed"} ${entry.sha256} (${entry.bytes} bytes, unreferenced for ${entry.ageMinutes} min)`,
    );
  }
  return report;
}

let timer: ReturnType<typeof setInterval> | undefined;

/** Sweeps at start-up and then every hour (unref'd: it never keeps the process alive). */
export function startOrphanSweeper(everyMs = 60 * 60 * 1000): void {
  if (timer) return;
  const run = () => void sweepOrphanBlobs().catch((err) => console.warn("[prooflight] orphan sweep failed:", (err as Error).message));
  run();
  timer = setInterval(run, everyMs);
  timer.unref();
}
