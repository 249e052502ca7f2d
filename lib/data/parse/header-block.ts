/** The header block: comment lines, `key: value` lines and `[Section]` lines above the table. */
import { isCommentLine, stripComment } from "./split-fields";

// Keys start with a letter; "://" is a URL, not a key/value separator.
const COLON_LINE = /^([A-Za-z_\u00C0-\uFFFF][^:=]{0,63}?)\s*:(?!\/\/)\s*(.*)$/;
const EQUALS_LINE = /^([A-Za-z_\u00C0-\uFFFF][^:=]{0,63}?)\s*=\s*(.*)$/;
const IDENTIFIER_EQUALS = /^[A-Za-z_][\w.-]*\s*=/;
const SECTION_LINE = /^\s*\[[^\]]{1,64}\]\s*$/;
const DATA_PUNCTUATION = /[,;\t]/;

/** `# sample: D-17` → ["sample", "D-17"]; null when the line is not a key/value pair. */
function parseMetadataLine(line: string): [string, string] | null {
  const comment = isCommentLine(line);
  const body = comment ? stripComment(line) : line.trim();
  const colon = COLON_LINE.exec(body);
  const m = colon ?? EQUALS_LINE.exec(body);
  if (!m) return null;
  const key = m[1].trim();
  if (!comment) {
    // Outside comments, a delimiter in the key means a table row; `a=1,b=2` is a row too,
    // so `=` only counts for a plain identifier on a line without delimiters.
    if (DATA_PUNCTUATION.test(key)) return null;
    if (!colon && (!IDENTIFIER_EQUALS.test(body) || DATA_PUNCTUATION.test(body))) return null;
  }
  return [key, m[2].trim()];
}

function isSectionLine(line: string): boolean {
  return SECTION_LINE.test(line);
}

/** Lines that belong to the header block before the first table line. */
export function isPreambleLine(line: string): boolean {
  return isCommentLine(line) || isSectionLine(line) || parseMetadataLine(line) !== null;
}

/** Assigns without ever hitting the `__proto__` setter, whatever the file's keys are. */
export function setOwn(target: Record<string, string>, key: string, value: string): void {
  Object.defineProperty(target, key, { value, enumerable: true, writable: true, configurable: true });
}

export function collectMetadata(lines: string[], into: Record<string, string>): void {
  for (const l of lines) {
    const kv = parseMetadataLine(l);
    if (kv) setOwn(into, kv[0], kv[1]);
  }
}
