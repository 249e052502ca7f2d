/**
 * Bytes → text. Refuses binary files that pose as text (415) before anything else looks at
 * them, then picks the encoding: BOM first, then strict UTF-8, then Latin-1 as the fallback
 * that never fails (old Windows instrument software still writes it).
 */
import type { TextEncodingName } from "./types";
import { formatCount } from "../format";
import { fail } from "./parse-error";

export interface DecodedText {
  text: string;
  encoding: TextEncodingName;
  warnings: string[];
}

interface Magic {
  bytes: number[];
  what: string;
}

const MAGICS: Magic[] = [
  { bytes: [0x7f, 0x45, 0x4c, 0x46], what: "a Linux executable (ELF)" },
  { bytes: [0x50, 0x4b, 0x03, 0x04], what: "a ZIP archive (or an Excel/Office file)" },
  { bytes: [0x50, 0x4b, 0x05, 0x06], what: "an empty ZIP archive" },
  { bytes: [0x25, 0x50, 0x44, 0x46, 0x2d], what: "a PDF document" },
  { bytes: [0x1f, 0x8b], what: "a gzip-compressed file" },
  { bytes: [0x89, 0x50, 0x4e, 0x47], what: "a PNG image" },
  { bytes: [0xff, 0xd8, 0xff], what: "a JPEG image" },
  { bytes: [0x89, 0x48, 0x44, 0x46], what: "an HDF5 file" },
  { bytes: [0x49, 0x49, 0x2a, 0x00], what: "a TIFF image" },
  { bytes: [0x4d, 0x4d, 0x00, 0x2a], what: "a TIFF image" },
  { bytes: [0xd0, 0xcf, 0x11, 0xe0], what: "an old Office document (.xls/.doc)" },
];

const SNIFF_BYTES = 64 * 1024;

function startsWith(bytes: Uint8Array, magic: number[]): boolean {
  if (bytes.length < magic.length) return false;
  for (let i = 0; i < magic.length; i++) if (bytes[i] !== magic[i]) return false;
  return true;
}

function refuseBinary(fileName: string, what: string): never {
  fail("binary", fileName, {}, `this looks like ${what}, not a text table; export the data as CSV, TSV, plain text or JSON.`);
}

function sniffMagic(bytes: Uint8Array, fileName: string): void {
  for (const m of MAGICS) if (startsWith(bytes, m.bytes)) refuseBinary(fileName, m.what);
  // "MZ" alone could start a header such as "MZ_pos,…"; a real DOS/PE header has NULs right after.
  if (bytes[0] === 0x4d && bytes[1] === 0x5a && bytes.subarray(2, 64).includes(0)) {
    refuseBinary(fileName, "a Windows executable");
  }
}

/** UTF-16 without a BOM shows up as ASCII with a NUL in every other byte. */
function guessBomlessUtf16(bytes: Uint8Array): "utf-16le" | "utf-16be" | null {
  const n = Math.min(bytes.length, SNIFF_BYTES) & ~1;
  if (n < 4) return null;
  let evenNul = 0;
  let oddNul = 0;
  for (let i = 0; i < n; i += 2) {
    if (bytes[i] === 0) evenNul++;
    if (bytes[i + 1] === 0) oddNul++;
  }
  const pairs = n / 2;
  if (oddNul > 0.9 * pairs && evenNul === 0) return "utf-16le";
  if (evenNul > 0.9 * pairs && oddNul === 0) return "utf-16be";
  return null;
}

function decodeUtf16(bytes: Uint8Array, bigEndian: boolean, fileName: string): string {
  if (bytes.length % 2 !== 0) {
    fail(
      "encoding",
      fileName,
      {},
      `the file is marked as UTF-16 but has an odd number of bytes (${formatCount(bytes.length)}), so it is cut off or not UTF-16.`,
    );
  }
  let le = bytes;
  if (bigEndian) {
    // Swap to little-endian ourselves: a "utf-16be" TextDecoder needs full ICU, which not every Node has.
    le = new Uint8Array(bytes.length);
    for (let i = 0; i < bytes.length; i += 2) {
      le[i] = bytes[i + 1];
      le[i + 1] = bytes[i];
    }
  }
  try {
    return new TextDecoder("utf-16le", { fatal: true }).decode(le);
  } catch {
    return fail("encoding", fileName, {}, "the file is marked as UTF-16 but contains invalid character sequences.");
  }
}

function decodeLatin1(bytes: Uint8Array): string {
  try {
    // WHATWG maps latin1 to windows-1252, which is what Windows software actually writes.
    return new TextDecoder("windows-1252").decode(bytes);
  } catch {
    let s = "";
    for (let i = 0; i < bytes.length; i += 8192) s += String.fromCharCode(...bytes.subarray(i, i + 8192));
    return s;
  }
}

/** Text with many control characters (other than tab, CR, LF, FF) is binary data in disguise. */
function checkControlShare(text: string, fileName: string): void {
  const n = Math.min(text.length, SNIFF_BYTES);
  let ctrl = 0;
  for (let i = 0; i < n; i++) {
    const c = text.charCodeAt(i);
    if ((c < 32 && c !== 9 && c !== 10 && c !== 13 && c !== 12) || c === 127) ctrl++;
  }
  if (ctrl > 0 && ctrl >= Math.max(4, n * 0.01)) {
    refuseBinary(fileName, `binary data (${formatCount(ctrl)} control characters in the first ${formatCount(n)})`);
  }
}

function highByteShare(bytes: Uint8Array): number {
  const n = Math.min(bytes.length, SNIFF_BYTES);
  let high = 0;
  for (let i = 0; i < n; i++) if (bytes[i] >= 0x80) high++;
  return n === 0 ? 0 : high / n;
}

export function decodeBytes(bytes: Uint8Array, fileName: string): DecodedText {
  if (bytes.length === 0) fail("empty", fileName, {}, "the file is empty (0 bytes).");
  const warnings: string[] = [];
  if (bytes[0] === 0xff && bytes[1] === 0xfe) {
    if (bytes[2] === 0 && bytes[3] === 0 && bytes.length >= 4) {
      fail("encoding", fileName, {}, "the file is UTF-32, which is not supported; save it as UTF-8.");
    }
    return finish(decodeUtf16(bytes.subarray(2), false, fileName), "utf-16le", warnings, fileName);
  }
  if (bytes[0] === 0xfe && bytes[1] === 0xff) {
    return finish(decodeUtf16(bytes.subarray(2), true, fileName), "utf-16be", warnings, fileName);
  }
  sniffMagic(bytes, fileName);
  const hasBom = bytes[0] === 0xef && bytes[1] === 0xbb && bytes[2] === 0xbf;
  if (bytes.includes(0)) {
    const guess = hasBom ? null : guessBomlessUtf16(bytes);
    if (!guess) refuseBinary(fileName, `binary data (it contains NUL bytes, the first at byte ${formatCount(bytes.indexOf(0) + 1)})`);
    warnings.push(`no byte-order mark, but the bytes are ${guess === "utf-16le" ? "UTF-16 LE" : "UTF-16 BE"}; read as such`);
    return finish(decodeUtf16(bytes, guess === "utf-16be", fileName), guess, warnings, fileName);
  }
  const body = hasBom ? bytes.subarray(3) : bytes;
  try {
    const text = new TextDecoder("utf-8", { fatal: true, ignoreBOM: true }).decode(body);
    return finish(text, hasBom ? "utf-8-bom" : "utf-8", warnings, fileName);
  } catch {
    if (hasBom) fail("encoding", fileName, {}, "the file starts with a UTF-8 byte-order mark but is not valid UTF-8.");
  }
  // Real Latin-1 text has a few accented letters or µ signs, not a majority of high bytes.
  if (highByteShare(bytes) > 0.3) refuseBinary(fileName, "binary data (most bytes are outside the text range)");
  warnings.push("not valid UTF-8; read as Latin-1 (Windows-1252)");
  return finish(decodeLatin1(bytes), "latin-1", warnings, fileName);
}

function finish(text: string, encoding: TextEncodingName, warnings: string[], fileName: string): DecodedText {
  checkControlShare(text, fileName);
  // Old DOS-era instrument software ends files with Ctrl-Z (0x1A).
  return { text: text.endsWith("\u001a") ? text.slice(0, -1) : text, encoding, warnings };
}
