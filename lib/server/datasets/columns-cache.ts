import "server-only";
import { removeTemp, tempPath } from "../storage/blob-store";
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
 * in the store's cache (uploads/cache, or the bucket shared by every instance), and rebuilt from the raw bytes when missing (in the ingest child,
 * as at upload, so a rebuild does not hold the file and its parse in this process either).
 */
export async function columnsFor(sha256: string, fileName: string, parseOptions: IngestJob["options"] = {}): Promise<Uint8Array> {
  const hit = lru.get(sha256);
  if (hit) {
    lru.delete(sha256);
    lru.set(sha256, hit);
    return hit;
  }
  const name = columnsCacheName(sha256);
  let blob = await blobStore().readCache(name);
  if (!blob) {
    const output = tempPath();
    try {
      await blobStore().withLocalFile(sha256, (input) => ingestInChild({ input, output, fileName, options: parseOptions }));
      await blobStore().putCache(name, output);
    } finally {
      await removeTemp(output);
    }
    blob = await blobStore().readCache(name);
    if (!blob) throw new Error(`the columnar cache of ${sha256} was rebuilt but cannot be read`);
  }
  remember(sha256, blob);
  return blob;
}

/** `<sha256>.columns`: uploads/cache/<sha256>.columns on disk, as before the store existed. */
export function columnsCacheName(sha256: string): string {
  if (!/^[0-9a-f]{64}$/.test(sha256)) throw new Error("not a sha256");
  return `${sha256}.columns`;
}
