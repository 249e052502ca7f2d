/**
 * Entry point of the parsing layer: instrument file bytes → a column-major table.
 * Pure: no file system, no framework; every failure is a ParseError with a location.
 */
import type { ParsedTable, ParseOptions } from "./types";
import { decodeBytes } from "./decode-bytes";
import { parseDelimited } from "./parse-delimited";
import { parseJson } from "./parse-json";

export type { ParsedTable, ParseOptions } from "./types";
export { ParseError } from "./parse-error";

/** `{…}` always; `[…]` only when it does not look like an instrument section header such as `[Data]`. */
function looksLikeJson(text: string, fileName: string): boolean {
  if (fileName.toLowerCase().endsWith(".json")) return true;
  const m = /^\s*([[{])\s*(.?)/.exec(text.slice(0, 256));
  if (!m) return false;
  return m[1] === "{" || /^[[{"\d\-\]tfn]$/.test(m[2]);
}

export function parseTable(bytes: Uint8Array, opts: ParseOptions): ParsedTable {
  const decoded = decodeBytes(bytes, opts.fileName);
  const format = opts.format ?? "auto";
  if (format === "json" || (format === "auto" && looksLikeJson(decoded.text, opts.fileName))) {
    return parseJson(decoded, opts);
  }
  return parseDelimited(decoded, opts);
}
