import "server-only";
import { encodeColumnar } from "@/lib/data/columnar";
import { parseTable } from "@/lib/data/parse";
import { blobPath, readCache, readFileBytes, writeCache } from "../storage/blob-store";

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
 * on disk under uploads/cache, and rebuilt from the raw bytes when missing.
 */
export async function columnsFor(sha256: string, fileName: string, parseOptions: Record<string, unknown> = {}): Promise<Uint8Array> {
  const hit = lru.get(sha256);
  if (hit) {
    lru.delete(sha256);
    lru.set(sha256, hit);
    return hit;
  }
  let blob = await readCache(sha256);
  if (!blob) {
    const raw = await readFileBytes(blobPath(sha256));
    blob = encodeColumnar(parseTable(raw, { fileName, ...parseOptions }));
    await writeCache(sha256, blob);
  }
  remember(sha256, blob);
  return blob;
}
