import "server-only";
import { commitCache, readCache, removeTemp, tempPath } from "../storage/blob-store";
import { blobStore } from "../storage/store";
import { ingestInChild, type IngestJob } from "./ingest-in-child";

const MAX_BYTES = 96 * 1024 * 1024;
const lru = new Map<string, Uint8Array>();
let held = 0;

function remember(sha: string, blob: Uint8Array) {
  lru.delete(sha);
  lru.set(sha, blob);
  held += blob.byteLength;
  while (held > MAX_BYTES && lru.size > 1) {
    const [oldest, b] = lru.entries().next().value as [string, Uint8Array];
    lru.delete(oldest);
    held -= b.byteLength;
  }
}

/**
 * The parsed numbers of a stored file, as a columnar blob. Derived data: kept in memory (LRU),
 * on disk under uploads/cache, and rebuilt from the raw bytes when missing (in the ingest child,
 * as at upload, so a rebuild does not hold the file and its parse in this process either).
 */
export async function columnsFor(sha256: string, fileName: string, parseOptions: IngestJob["options"] = {}): Promise<Uint8Array> {
  const hit = lru.get(sha256);
  if (hit) {
    lru.delete(sha256);
    lru.set(sha256, hit);
    return hit;
  }
  let blob = await readCache(sha256);
  if (!blob) {
    const output = tempPath();
    try {
      await blobStore().withLocalFile(sha256, (input) => ingestInChild({ input, output, fileName, options: parseOptions }));
      await commitCache(output, sha256);
    } finally {
      await removeTemp(output);
    }
    blob = await readCache(sha256);
    if (!blob) throw new Error(`the columnar cache of ${sha256} was rebuilt but cannot be read`);
  }
  remember(sha256, blob);
  return blob;
}
