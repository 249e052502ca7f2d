/**
 * Delimiter and decimal mark from a sample of lines. Each candidate pair is scored by how
 * consistent the field count is and how many cells read as numbers; `1,5;2,5` therefore comes
 * out as `;` with a decimal comma, and `1.5,2.5` as `,` with a decimal point.
 */
import type { DecimalMark, DelimiterOption, ParseOptions } from "./types";
import { isMissingCell, isNumericCell } from "./parse-cell";
import { splitFields, splitHeaderFields } from "./split-fields";

export interface DelimiterChoice {
  delimiter: DelimiterOption;
  decimal: DecimalMark;
  decimalDetected: boolean;
}

const DETECT_LINES = 40;
const DETECT_CHARS = 64 * 1024;

/** Tie-break order: the file extension says what the author most likely meant. */
function delimiterOrder(opts: ParseOptions): DelimiterOption[] {
  if (opts.delimiter) return [opts.delimiter];
  if (opts.format === "csv") return [",", ";"];
  if (opts.format === "tsv") return ["\t"];
  if (opts.format === "text") return ["whitespace"];
  const ext = opts.fileName.toLowerCase().split(".").pop() ?? "";
  if (ext === "tsv" || ext === "tab") return ["\t", ",", ";", "whitespace"];
  if (["txt", "dat", "asc", "xy", "prn", "spe"].includes(ext)) return ["whitespace", "\t", ";", ","];
  return [",", ";", "\t", "whitespace"];
}

function score(lines: string[], delimiter: DelimiterOption, decimal: DecimalMark): number {
  const comma = decimal === ",";
  const rows = lines.map((l) => splitFields(l, delimiter));
  // The first line may be a header with a different shape; judge the rest when there is a rest.
  const body = rows.length > 1 ? rows.slice(1) : rows;
  const freq = new Map<number, number>();
  for (const r of body) freq.set(r.length, (freq.get(r.length) ?? 0) + 1);
  let modal = 0;
  let modalCount = 0;
  for (const [len, cnt] of freq) {
    if (cnt > modalCount || (cnt === modalCount && len > modal)) {
      modal = len;
      modalCount = cnt;
    }
  }
  let numeric = 0;
  let text = 0;
  for (const r of body) {
    for (const f of r) {
      if (isNumericCell(f, comma)) numeric++;
      else if (!isMissingCell(f)) text++;
    }
  }
  const numFrac = numeric + text === 0 ? 0 : numeric / (numeric + text);
  // A header that does not fit the rows speaks against the candidate: with `c0\n1,5\n2,5` the
  // comma would split every row in two, but the header names a single column.
  const headerFits = rows.length < 2 || splitHeaderFields(lines[0], delimiter, modal).length === modal;
  return (modal >= 2 ? 1 : 0.45) * (headerFits ? 1 : 0.4) * (modalCount / body.length) * (0.25 + 0.75 * numFrac);
}

export function chooseDelimiter(sample: string[], opts: ParseOptions): DelimiterChoice {
  const lines: string[] = [];
  let chars = 0;
  for (const l of sample) {
    if (lines.length >= DETECT_LINES || (chars > DETECT_CHARS && lines.length >= 2)) break;
    lines.push(l);
    chars += l.length;
  }
  const decimals: DecimalMark[] = opts.decimal ? [opts.decimal] : [".", ","];
  let best: DelimiterChoice | null = null;
  let bestScore = -1;
  for (const delimiter of delimiterOrder(opts)) {
    for (const decimal of decimals) {
      const s = score(lines, delimiter, decimal);
      // Strictly greater: earlier candidates (preferred delimiter, decimal point) win ties.
      if (s > bestScore + 1e-9) {
        bestScore = s;
        best = { delimiter, decimal, decimalDetected: !opts.decimal };
      }
    }
  }
  return best as DelimiterChoice;
}
