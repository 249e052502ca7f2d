import "server-only";
import { unzipSync, type UnzipFileInfo } from "fflate";
import { AppError, unprocessable } from "@/lib/errors";

/** Archive limits: a bundle is refused before anything is unpacked when it passes one. */
const MAX_ENTRIES = 10_000;
const MAX_UNPACKED_BYTES = 2 * 1024 ** 3;
const MAX_RATIO = 100;

const CENTRAL_HEADER = 0x02014b50;
const END_OF_CENTRAL_DIRECTORY = 0x06054b50;
const UNIX_HOST = 3;
const S_IFMT = 0o170000;
const S_IFLNK = 0o120000;

/**
 * Names of the entries the central directory marks as symbolic links (Unix mode in the external
 * attributes). fflate unpacks a link as a small file holding its target; an importer must not
 * take it for data.
 */
function symlinkEntries(zip: Uint8Array): string[] {
  const view = new DataView(zip.buffer, zip.byteOffset, zip.byteLength);
  let end = -1;
  for (let i = zip.byteLength - 22; i >= Math.max(0, zip.byteLength - 22 - 65_535); i--) {
    if (view.getUint32(i, true) === END_OF_CENTRAL_DIRECTORY) {
      end = i;
      break;
    }
  }
  if (end < 0) return [];
  const count = view.getUint16(end + 10, true);
  let at = view.getUint32(end + 16, true);
  const links: string[] = [];
  for (let k = 0; k < count && at + 46 <= zip.byteLength && view.getUint32(at, true) === CENTRAL_HEADER; k++) {
    const host = view.getUint16(at + 4, true) >> 8;
    const nameLength = view.getUint16(at + 28, true);
    const extraLength = view.getUint16(at + 30, true);
    const commentLength = view.getUint16(at + 32, true);
    const mode = view.getUint32(at + 38, true) >>> 16;
    if (host === UNIX_HOST && (mode & S_IFMT) === S_IFLNK) links.push(new TextDecoder().decode(zip.subarray(at + 46, at + 46 + nameLength)));
    at += 46 + nameLength + extraLength + commentLength;
  }
  return links;
}

/**
 * The zip's entries, after refusing archives that are unsafe to unpack (422, naming the entry):
 * absolute or `..` paths, links, a name twice, more than 10,000 entries, more than 2 GB unpacked,
 * a compression ratio over 100×, an entry whose unpacked size is not the size its header declares,
 * or bytes that are not a zip archive. Sizes are checked from the headers before anything is
 * inflated, and every entry's output is bounded by its declared size.
 */
export function unpackArchive(zipBytes: Uint8Array): Record<string, Uint8Array> {
  const links = symlinkEntries(zipBytes);
  if (links.length) throw unprocessable(`The archive holds a link, which is refused: ${JSON.stringify(links[0])}.`);
  const seen = new Map<string, number>();
  let unpacked = 0;
  let packed = 0;
  const check = (f: UnzipFileInfo) => {
    if (seen.size >= MAX_ENTRIES) throw unprocessable(`The archive has more than ${MAX_ENTRIES} entries.`);
    if (f.name.startsWith("/") || /^[A-Za-z]:/.test(f.name) || f.name.includes("\\") || f.name.split("/").includes(".."))
      throw unprocessable(`The archive holds an unsafe path: ${JSON.stringify(f.name)}.`);
    if (seen.has(f.name)) throw unprocessable(`The archive holds ${JSON.stringify(f.name)} twice.`);
    seen.set(f.name, f.originalSize);
    unpacked += f.originalSize;
    packed += f.size;
    if (unpacked > MAX_UNPACKED_BYTES) throw unprocessable(`The archive unpacks to more than ${MAX_UNPACKED_BYTES / 1024 ** 3} GB.`);
    if (unpacked > 1024 * 1024 && unpacked > MAX_RATIO * Math.max(packed, 1))
      throw unprocessable(`The archive is compressed more than ${MAX_RATIO}× (${unpacked} bytes from ${packed}).`);
    return !f.name.endsWith("/");
  };
  let out: Record<string, Uint8Array>;
  try {
    out = unzipSync(zipBytes, { filter: check });
  } catch (err) {
    if (err instanceof AppError) throw err;
    throw unprocessable(`Not a readable zip archive: ${err instanceof Error ? err.message : String(err)}.`);
  }
  for (const [name, bytes] of Object.entries(out)) {
    const declared = seen.get(name)!;
    if (bytes.byteLength !== declared)
      throw unprocessable(`The archive entry ${JSON.stringify(name)} declares ${declared} bytes but holds ${bytes.byteLength}.`);
  }
  return out;
}
