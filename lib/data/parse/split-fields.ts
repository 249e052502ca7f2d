/**
 * Line and field splitting for the small parts of a file that are read line by line (the header
 * block and a sample of the data). The bulk of the data goes through scan-delimited.ts instead.
 */
import type { DelimiterOption } from "./types";

export interface TextLine {
  text: string;
  /** Offset of the first character of the line. */
  start: number;
  /** Offset just past the line terminator (the next line's start). */
  next: number;
  /** 1-based line number. */
  line: number;
}

/** Reads the line starting at `start`; CRLF, LF and lone CR all end a line. */
export function readLine(text: string, start: number, line: number): TextLine {
  let i = start;
  const n = text.length;
  while (i < n) {
    const c = text.charCodeAt(i);
    if (c === 10 || c === 13) break;
    i++;
  }
  let next = i;
  if (next < n) next += text.charCodeAt(next) === 13 && text.charCodeAt(next + 1) === 10 ? 2 : 1;
  return { text: text.slice(start, i), start, next, line };
}

export function isBlank(line: string): boolean {
  return line.trim() === "";
}

export function isCommentLine(line: string): boolean {
  const s = line.trimStart();
  return s.startsWith("#") || s.startsWith("%") || s.startsWith("//");
}

/** Removes the comment marker(s) of a comment line: `## x`, `% x`, `// x` → `x`. */
export function stripComment(line: string): string {
  return line
    .trimStart()
    .replace(/^(#+|%+|\/\/+)\s?/, "")
    .trim();
}

const QUOTE = 34;

/** Splits one line into trimmed fields; double quotes group text and `""` is a literal quote. */
export function splitFields(line: string, delim: DelimiterOption): string[] {
  return delim === "whitespace" ? splitWhitespace(line) : splitOn(line, delim.charCodeAt(0));
}

function splitOn(line: string, d: number): string[] {
  const out: string[] = [];
  const n = line.length;
  let i = 0;
  for (;;) {
    while (i < n && line.charCodeAt(i) === 32) i++;
    if (i < n && line.charCodeAt(i) === QUOTE) {
      const q = readQuoted(line, i + 1);
      let j = q.end;
      // Anything between the closing quote and the delimiter is kept, as spreadsheets do.
      while (j < n && line.charCodeAt(j) !== d) j++;
      out.push((q.value + line.slice(q.end, j)).trim());
      i = j;
    } else {
      let j = i;
      while (j < n && line.charCodeAt(j) !== d) j++;
      out.push(line.slice(i, j).trim());
      i = j;
    }
    if (i >= n) break;
    i++; // past the delimiter
  }
  return out;
}

function splitWhitespace(line: string): string[] {
  const out: string[] = [];
  const n = line.length;
  let i = 0;
  for (;;) {
    while (i < n && isSpace(line.charCodeAt(i))) i++;
    if (i >= n) break;
    if (line.charCodeAt(i) === QUOTE) {
      const q = readQuoted(line, i + 1);
      out.push(q.value.trim());
      i = q.end;
      while (i < n && !isSpace(line.charCodeAt(i))) i++;
    } else {
      let j = i;
      while (j < n && !isSpace(line.charCodeAt(j))) j++;
      out.push(line.slice(i, j));
      i = j;
    }
  }
  return out;
}

function isSpace(c: number): boolean {
  return c === 32 || c === 9;
}

/**
 * Reads a quoted run starting just after the opening quote; `""` is a literal quote and an
 * unterminated quote runs to the end. Counts the line breaks inside for line numbering.
 */
export function readQuoted(s: string, from: number): { value: string; end: number; newlines: number; closed: boolean } {
  let value = "";
  let i = from;
  const n = s.length;
  let runStart = i;
  let newlines = 0;
  while (i < n) {
    const c = s.charCodeAt(i);
    if (c === QUOTE) {
      value += s.slice(runStart, i);
      if (s.charCodeAt(i + 1) === QUOTE) {
        value += '"';
        i += 2;
        runStart = i;
        continue;
      }
      return { value, end: i + 1, newlines, closed: true };
    }
    if (c === 10 || (c === 13 && s.charCodeAt(i + 1) !== 10)) newlines++;
    i++;
  }
  return { value: value + s.slice(runStart, n), end: n, newlines, closed: false };
}

/**
 * Whitespace headers often have spaces inside names: `time (us)   counts`. When the plain split
 * does not give `expected` names, try splitting on runs of 2+ spaces or tabs, then gluing unit
 * tokens such as `(us)` or `[mT]` to the name before them.
 */
export function splitHeaderFields(line: string, delim: DelimiterOption, expected: number): string[] {
  const plain = splitFields(line, delim);
  if (delim !== "whitespace" || plain.length === expected) return plain;
  const wide = line
    .trim()
    .split(/\t+| {2,}/)
    .map((s) => s.trim())
    .filter((s) => s !== "");
  if (wide.length === expected) return wide;
  const glued: string[] = [];
  for (const tok of plain) {
    if (glued.length > 0 && (/^[([].*[)\]]$/.test(tok) || tok === "/")) glued[glued.length - 1] += ` ${tok}`;
    else if (glued.length > 0 && glued[glued.length - 1].endsWith(" /")) glued[glued.length - 1] += ` ${tok}`;
    else glued.push(tok);
  }
  return glued.length === expected ? glued : plain;
}
