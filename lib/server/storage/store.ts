import "server-only";
import { env, type Env } from "@/lib/env";
import type { BlobStore } from "./blob-contract";
import { LocalBlobStore } from "./local-store";
import { S3BlobStore } from "./s3-store";

let current: { settings: Env; store: BlobStore } | undefined;

/** The process's store, as the environment configures it (STORAGE, UPLOADS_DIR, S3_*). */
export function blobStore(): BlobStore {
  const settings = env();
  if (current?.settings === settings) return current.store;
  const s = settings.storage;
  const store = s.kind === "s3" ? new S3BlobStore(s) : new LocalBlobStore(settings.uploadsDir);
  current = { settings, store };
  return store;
}
