/** The one error type of the parsing layer; its message is written for the person who made the file. */

export type ParseErrorCode =
  | "empty"
  | "binary"
  | "ragged"
  | "unclosed_quote"
  | "non_numeric"
  | "duplicate_header"
  | "empty_header"
  | "no_numeric_column"
  | "too_many_columns"
  | "bad_json"
  | "encoding";

export interface ParseLocation {
  line?: number;
  column?: number;
  columnName?: string;
}

/** Unsupported media → 415; malformed JSON syntax → 400; a readable file with bad content → 422. */
function statusFor(code: ParseErrorCode): 400 | 415 | 422 {
  if (code === "binary" || code === "encoding") return 415;
  if (code === "bad_json") return 400;
  return 422;
}

export class ParseError extends Error {
  readonly code: ParseErrorCode;
  readonly httpStatus: 400 | 415 | 422;
  readonly fileName: string;
  readonly line?: number;
  readonly column?: number;
  readonly columnName?: string;

  constructor(code: ParseErrorCode, message: string, fileName: string, loc: ParseLocation = {}) {
    super(message);
    this.name = "ParseError";
    this.code = code;
    this.httpStatus = statusFor(code);
    this.fileName = fileName;
    if (loc.line !== undefined) this.line = loc.line;
    if (loc.column !== undefined) this.column = loc.column;
    if (loc.columnName !== undefined) this.columnName = loc.columnName;
  }
}

/** `data.csv, line 12, column 3 ("counts")` — the location prefix every message starts with. */
export function describeLocation(fileName: string, loc: ParseLocation = {}): string {
  let s = fileName;
  if (loc.line !== undefined) s += `, line ${loc.line}`;
  if (loc.column !== undefined) {
    s += `, column ${loc.column}`;
    if (loc.columnName) s += ` (${quote(loc.columnName)})`;
  }
  return s;
}

/** Throws a ParseError whose message is `<location>: <what>`. */
export function fail(code: ParseErrorCode, fileName: string, loc: ParseLocation, what: string): never {
  throw new ParseError(code, `${describeLocation(fileName, loc)}: ${what}`, fileName, loc);
}

/** Quotes a cell for a message, cut short so a 10 kB cell cannot flood a toast. */
export function quote(value: string, max = 40): string {
  const v = value.length > max ? `${value.slice(0, max - 1)}…` : value;
  return JSON.stringify(v);
}
