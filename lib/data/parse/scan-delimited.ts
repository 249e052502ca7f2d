/**
 * The bulk scanner for delimited text: one pass of charCodeAt over the decoded string, numbers
 * written straight into growable Float64Arrays (no per-row string arrays). Plain decimals are
 * parsed inline (exact by Clinger's fast path); anything else — quotes, 17-digit mantissas, NaN,
 * inf, Fortran exponents — goes through parseCell, so results always equal Number() of the cell.
 */
import type { ColumnType, DecimalMark, DelimiterOption } from "./types";
import { POW10, parseCell } from "./parse-cell";
import { readQuoted } from "./split-fields";

export interface ScanConfig {
  text: string;
  /** Offset and 1-based line number of the first data row. */
  start: number;
  line: number;
  delimiter: DelimiterOption;
  decimal: DecimalMark;
  types: ColumnType[];
  /** Expected row count; buffers start at this size and grow by 1.5× when it is wrong. */
  capacityHint: number;
}

interface ColumnStats {
  missing: number;
  /** Text cells in a numeric column (each also stored as NaN). */
  bad: number;
  firstBadLine: number;
  firstBadRow: number;
  firstBadValue: string;
}

export interface ScanResult {
  data: Array<Float64Array | string[]>;
  rowCount: number;
  blankLines: number;
  commentLines: number;
  stats: ColumnStats[];
  /** Set when a row has a different number of fields; the scan stops there. */
  ragged: { line: number; found: number } | null;
  /** Set when a quoted field runs to the end of the file: the line where its quote opened. */
  unclosedQuote: { line: number; column: number } | null;
}

const LF = 10;
const CR = 13;
const SP = 32;
const TAB = 9;
const QUOTE = 34;
const HASH = 35;
const PERCENT = 37;
const EOF = -1;
const MAX_EXACT = 9007199254740992; // 2^53

class DelimitedScanner {
  readonly text: string;
  readonly n: number;
  pos: number;
  line: number;
  readonly ws: boolean;
  readonly delim: number;
  /** Decimal mark for unquoted cells; -2 when it equals the delimiter (then only quoted cells may use it). */
  readonly dec: number;
  readonly comma: boolean;
  bad = false;
  unclosedQuoteLine = 0;

  constructor(cfg: ScanConfig) {
    this.text = cfg.text;
    this.n = cfg.text.length;
    this.pos = cfg.start;
    this.line = cfg.line;
    this.ws = cfg.delimiter === "whitespace";
    this.delim = this.ws ? SP : cfg.delimiter.charCodeAt(0);
    const dec = cfg.decimal.charCodeAt(0);
    this.dec = dec === this.delim ? -2 : dec;
    this.comma = cfg.decimal === ",";
  }

  at(i: number): number {
    return i < this.n ? this.text.charCodeAt(i) : EOF;
  }

  isEnd(c: number): boolean {
    return this.ws ? c === SP || c === TAB || c === LF || c === CR || c === EOF : c === this.delim || c === LF || c === CR || c === EOF;
  }

  /** Reads a numeric field; NaN for missing and for text (then `bad` is set). Leaves pos on the terminator. */
  numberField(): number {
    const text = this.text;
    const n = this.n;
    let i = this.pos;
    let c = i < n ? text.charCodeAt(i) : EOF;
    if (!this.ws) while (c === SP) c = ++i < n ? text.charCodeAt(i) : EOF;
    const start = i;
    // Exports that quote every cell ("1.5","2") stay on the fast path.
    const quoted = c === QUOTE;
    if (quoted) c = ++i < n ? text.charCodeAt(i) : EOF;
    let neg = false;
    if (c === 45) {
      neg = true;
      c = ++i < n ? text.charCodeAt(i) : EOF;
    } else if (c === 43) c = ++i < n ? text.charCodeAt(i) : EOF;
    let m = 0;
    let exp = 0;
    let digits = 0;
    while (c >= 48 && c <= 57) {
      m = m * 10 + (c - 48);
      digits++;
      c = ++i < n ? text.charCodeAt(i) : EOF;
    }
    if (c === this.dec) {
      c = ++i < n ? text.charCodeAt(i) : EOF;
      while (c >= 48 && c <= 57) {
        m = m * 10 + (c - 48);
        digits++;
        exp--;
        c = ++i < n ? text.charCodeAt(i) : EOF;
      }
    }
    if (digits === 0) return this.slowNumber(start);
    if (c === 101 || c === 69) {
      c = ++i < n ? text.charCodeAt(i) : EOF;
      let eneg = false;
      if (c === 45) {
        eneg = true;
        c = ++i < n ? text.charCodeAt(i) : EOF;
      } else if (c === 43) c = ++i < n ? text.charCodeAt(i) : EOF;
      let e = 0;
      let ed = 0;
      while (c >= 48 && c <= 57) {
        if (e < 100000) e = e * 10 + (c - 48);
        ed++;
        c = ++i < n ? text.charCodeAt(i) : EOF;
      }
      if (ed === 0) return this.slowNumber(start);
      exp += eneg ? -e : e;
    }
    if (quoted) {
      if (c !== QUOTE) return this.slowNumber(start);
      c = ++i < n ? text.charCodeAt(i) : EOF;
    }
    if (!this.ws) while (c === SP) c = ++i < n ? text.charCodeAt(i) : EOF;
    if (!this.isEnd(c) || m > MAX_EXACT || exp > 22 || exp < -22) return this.slowNumber(start);
    this.pos = i;
    const v = exp >= 0 ? m * POW10[exp] : m / POW10[-exp];
    return neg ? -v : v;
  }

  /** Field end for an unquoted field, or the quoted value; updates pos (and line for quoted newlines). */
  rawField(start: number): string {
    const text = this.text;
    let i = start;
    let c = this.at(i);
    if (!this.ws) while (c === SP) c = this.at(++i);
    if (c === QUOTE) {
      const q = readQuoted(text, i + 1);
      if (!q.closed && !this.unclosedQuoteLine) this.unclosedQuoteLine = this.line;
      this.line += q.newlines;
      // Text between the closing quote and the delimiter is kept, as spreadsheets do.
      let j = q.end;
      while (!this.isEnd(this.at(j))) j++;
      this.pos = j;
      return (q.value + text.slice(q.end, j)).trim();
    }
    const from = i;
    while (!this.isEnd(c)) c = this.at(++i);
    this.pos = i;
    return text.slice(from, i).trim();
  }

  badText = "";

  slowNumber(start: number): number {
    const raw = this.rawField(start);
    const v = parseCell(raw, this.comma);
    if (v === undefined) {
      this.bad = true;
      this.badText = raw;
      return NaN;
    }
    return v;
  }

  /** Consumes one line terminator (CRLF, LF or CR) and counts the line. */
  endLine(): void {
    const c = this.at(this.pos);
    if (c === CR) {
      this.pos++;
      if (this.at(this.pos) === LF) this.pos++;
    } else if (c === LF) this.pos++;
    this.line++;
  }

  skipLine(): void {
    let c = this.at(this.pos);
    while (c !== LF && c !== CR && c !== EOF) c = this.at(++this.pos);
    this.endLine();
  }

  /** Fields left on the current line, counted roughly (for the ragged-row message only). */
  countRest(): number {
    let count = 1;
    let c = this.at(this.pos);
    let inField = true;
    while (c !== LF && c !== CR && c !== EOF) {
      if (this.ws) {
        const sep = c === SP || c === TAB;
        if (!sep && !inField) count++;
        inField = !sep;
      } else if (c === this.delim) count++;
      c = this.at(++this.pos);
    }
    return count;
  }
}

export function scanDelimited(cfg: ScanConfig): ScanResult {
  const s = new DelimitedScanner(cfg);
  const ncols = cfg.types.length;
  let cap = Math.max(16, Math.ceil(cfg.capacityHint));
  const nums: Array<Float64Array | null> = cfg.types.map((t) => (t === "number" ? new Float64Array(cap) : null));
  const strs: Array<string[] | null> = cfg.types.map((t) => (t === "string" ? [] : null));
  const stats: ColumnStats[] = cfg.types.map(() => ({ missing: 0, bad: 0, firstBadLine: 0, firstBadRow: -1, firstBadValue: "" }));
  // A "#…" line is only a comment when the first column cannot hold such text.
  const commentsAllowed = cfg.types[0] === "number";
  let row = 0;
  let blankLines = 0;
  let commentLines = 0;
  let ragged: ScanResult["ragged"] = null;
  let unclosedColumn = 0;

  rows: while (s.pos < s.n) {
    let c = s.at(s.pos);
    // In a TSV a line of tabs is a row of empty cells, not a blank line.
    const tabIsSpace = s.delim !== TAB;
    if (c === SP || (c === TAB && tabIsSpace)) {
      let j = s.pos + 1;
      while (s.at(j) === SP || (s.at(j) === TAB && tabIsSpace)) j++;
      const cj = s.at(j);
      if (cj === LF || cj === CR || cj === EOF || (commentsAllowed && (cj === HASH || cj === PERCENT))) {
        s.pos = j;
        c = cj;
      } else if (s.ws) {
        s.pos = j;
        c = cj;
      }
    }
    if (c === LF || c === CR || c === EOF) {
      blankLines++;
      s.endLine();
      continue;
    }
    if (commentsAllowed && (c === HASH || c === PERCENT)) {
      commentLines++;
      s.skipLine();
      continue;
    }
    if (row === cap) {
      cap = Math.ceil(cap * 1.5) + 1024;
      for (let j = 0; j < ncols; j++) {
        const old = nums[j];
        if (old) {
          const grown = new Float64Array(cap);
          grown.set(old);
          nums[j] = grown;
        }
      }
    }
    const rowLine = s.line;
    let col = 0;
    for (;;) {
      if (col === ncols) {
        ragged = { line: rowLine, found: ncols + s.countRest() };
        break rows;
      }
      const num = nums[col];
      if (num !== null) {
        const v = s.numberField();
        if (v !== v) {
          const st = stats[col];
          if (s.bad) {
            s.bad = false;
            if (st.bad++ === 0) {
              st.firstBadLine = rowLine;
              st.firstBadRow = row;
              st.firstBadValue = s.badText;
            }
          } else st.missing++;
        }
        num[row] = v;
      } else {
        (strs[col] as string[]).push(s.rawField(s.pos));
      }
      if (s.unclosedQuoteLine && !unclosedColumn) unclosedColumn = col + 1;
      c = s.at(s.pos);
      if (s.ws) {
        while (c === SP || c === TAB) c = s.at(++s.pos);
        if (c === LF || c === CR || c === EOF) break;
      } else if (c === s.delim) {
        s.pos++;
      } else break;
      col++;
    }
    if (col + 1 !== ncols) {
      ragged = { line: rowLine, found: col + 1 };
      break;
    }
    row++;
    s.endLine();
  }

  const data = cfg.types.map((_, j) => {
    const num = nums[j];
    // A view when the spare capacity is small: copying a million-row column only to trim it doubles peak memory.
    if (num) return cap === row ? num : cap - row <= row >> 3 ? num.subarray(0, row) : num.slice(0, row);
    return strs[j] as string[];
  });
  const unclosedQuote = s.unclosedQuoteLine ? { line: s.unclosedQuoteLine, column: unclosedColumn || 1 } : null;
  return { data, rowCount: row, blankLines, commentLines, stats, ragged, unclosedQuote };
}
