import "server-only";
import type { Readable } from "node:stream";

/** What the store knows of one stored file, without reading it. */
export interface BlobInfo {
  sha256: string;
  size: number;
  /** When it was last put (a put of bytes already stored refreshes it, so a sweep's grace counts from there). */
  lastModified: Date;
}

/** The store has no object under this hash. */
export class BlobMissingError extends Error {
  constructor(readonly sha256: string) {
    super(`the stored file ${sha256} is missing`);
  }
}

/**
 * Uploaded files, content-addressed by their SHA-256 under `ab/cd/<sha256>` (the same layout on
 * disk and as object keys). Stored files never change: putting the same hash twice keeps one copy.
 * Two implementations: `local` (the uploads folder, the default) and `s3` (an S3-compatible bucket,
 * so several instances can share the files).
 */
export interface BlobStore {
  readonly kind: "local" | "s3";
  /**
   * Stores a complete temporary file whose SHA-256 the caller computed while writing it; the
   * temporary file is gone afterwards either way. `created` is false when the hash was already stored.
   */
  putFile(tmp: string, sha256: string): Promise<{ created: boolean }>;
  /** Stores bytes from a stream, checking them against `sha256` first (a mismatch stores nothing and throws). */
  putStream(source: AsyncIterable<Uint8Array> | Iterable<Uint8Array>, sha256: string): Promise<{ created: boolean }>;
  /** The bytes as a stream; BlobMissingError when not stored. */
  openRead(sha256: string): Promise<Readable>;
  /** The whole file in memory: only for files known to be small enough. BlobMissingError when not stored. */
  readAll(sha256: string): Promise<Uint8Array>;
  stat(sha256: string): Promise<BlobInfo | null>;
  exists(sha256: string): Promise<boolean>;
  /** Every stored file with its size and last-modified time, in no promised order. */
  list(): AsyncIterable<BlobInfo>;
  /** Removes the file; removing one that is not there is not an error. */
  delete(sha256: string): Promise<void>;
  /**
   * Runs `work` with a path on this machine holding the bytes (for child processes and libraries
   * that read files): the stored file itself on disk; for object storage a temporary copy, hashed on
   * the way down and removed when `work` settles.
   */
  withLocalFile<T>(sha256: string, work: (file: string) => Promise<T>): Promise<T>;
  /**
   * Keeps a derived file (rebuildable from stored files: parsed columns, thumbnails) under a relative
   * name such as `thumbs/figure-<hash>.png`: `uploads/cache/<name>` on disk, `cache/<name>` in a bucket,
   * so every instance reuses what one of them made. Takes a complete temporary file, gone afterwards.
   */
  putCache(name: string, tmp: string): Promise<void>;
  /** The derived file, or null when it was never made (or has been cleared). */
  readCache(name: string): Promise<Uint8Array | null>;
}

const CACHE_NAME = /^[A-Za-z0-9][A-Za-z0-9._-]{0,199}(\/[A-Za-z0-9][A-Za-z0-9._-]{0,199})?$/;

/** A cache name: one or two plain path segments, no `..`, nothing absolute. */
export function assertCacheName(name: string): void {
  if (!CACHE_NAME.test(name) || name.includes("..")) throw new Error(`not a cache name: ${name}`);
}

const SHA256 = /^[0-9a-f]{64}$/;

function assertSha256(sha256: string): void {
  if (!SHA256.test(sha256)) throw new Error("not a sha256");
}

/** `ab/cd/<sha256>`: the relative path on disk and the object key. */
export function blobKey(sha256: string): string {
  assertSha256(sha256);
  return `${sha256.slice(0, 2)}/${sha256.slice(2, 4)}/${sha256}`;
}
