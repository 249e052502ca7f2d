/**
 * Works out how a delimited text file is laid out from its first lines: the header block,
 * delimiter and decimal mark, the header line, where the data start, column types, and
 * whether the numbers form a 2-D map. The bulk scan then runs with these settings fixed.
 */
import type { ColumnType, DecimalMark, DelimiterOption, ParseOptions } from "./types";
import { fail } from "./parse-error";
import { isMissingCell, isNumericCell } from "./parse-cell";
import { collectMetadata, isPreambleLine } from "./header-block";
import { isBlank, isCommentLine, readLine, splitFields, splitHeaderFields, stripComment, type TextLine } from "./split-fields";
import { chooseDelimiter } from "./choose-delimiter";
import { resolveUnit } from "../units";

export interface Layout {
  delimiter: DelimiterOption;
  decimal: DecimalMark;
  /** The decimal mark was found by looking at the data (not given in the options). */
  decimalDetected: boolean;
  headerLines: string[];
  metadata: Record<string, string>;
  header: string[] | null;
  /** 1-based line of the header (for messages); null without a header. */
  headerLine: number | null;
  headerFromComment: boolean;
  /** Offset and 1-based line where the data rows begin. */
  dataStart: number;
  dataLine: number;
  columnCount: number;
  types: ColumnType[];
  isMatrix: boolean;
  /** Blank lines skipped before the data start. */
  blankLines: number;
  /** Rough characters per data line, to size the column buffers once. */
  avgLineLength: number;
  warnings: string[];
}

const SAMPLE_LINES = 200;
const SAMPLE_CHARS = 512 * 1024;
/** A header-less, all-numeric block at least this wide is read as a 2-D map in "auto" mode. */
const MATRIX_MIN_COLUMNS = 10;

interface Sampled {
  lines: TextLine[];
  /** Comment lines seen among the sampled lines, with their line numbers. */
  comments: TextLine[];
  blanks: number[];
}

function sampleLines(text: string, pos: number, line: number): Sampled {
  const out: Sampled = { lines: [], comments: [], blanks: [] };
  let chars = 0;
  while (pos < text.length && out.lines.length < SAMPLE_LINES && (chars < SAMPLE_CHARS || out.lines.length < 5)) {
    const l = readLine(text, pos, line);
    if (isBlank(l.text)) out.blanks.push(line);
    else if (isCommentLine(l.text)) out.comments.push(l);
    else {
      out.lines.push(l);
      chars += l.text.length;
    }
    pos = l.next;
    line++;
  }
  return out;
}

export function detectLayout(text: string, opts: ParseOptions): Layout {
  const { fileName } = opts;
  const headerLines: string[] = [];
  const warnings: string[] = [];
  let blankLines = 0;
  let pos = 0;
  let line = 1;
  let lastPreamble: TextLine | null = null;
  for (;;) {
    if (pos >= text.length) break;
    const l = readLine(text, pos, line);
    if (isBlank(l.text)) blankLines++;
    else if (isPreambleLine(l.text)) {
      headerLines.push(l.text);
      lastPreamble = l;
    } else break;
    pos = l.next;
    line++;
  }
  const sample = sampleLines(text, pos, line);
  if (sample.lines.length === 0) {
    fail("empty", fileName, {}, headerLines.length > 0 ? "the file has only comment or header lines and no data." : "the file contains only blank lines.");
  }
  const choice = chooseDelimiter(
    sample.lines.map((l) => l.text),
    opts,
  );
  const { delimiter, decimal } = choice;
  const comma = decimal === ",";
  const rows = sample.lines.map((l) => splitFields(l.text, delimiter));
  const forcedMatrix = opts.format === "matrix";

  // A data row has a number in it, or holds nothing but missing cells (a header never does).
  const isDataRow = (r: string[]) => r.some((f) => isNumericCell(f, comma)) || r.every((f) => isMissingCell(f));
  let d = forcedMatrix ? 0 : rows.findIndex(isDataRow);
  // No numeric line at all: the first line is the header and the columns are text (rejected later).
  if (d === -1) d = 1;
  // Only a header in the sample: the scan still runs, because a TSV row of tabs looked blank
  // to the sampler; it reports "no data rows" if there really are none.
  const dataRow: string[] | undefined = rows[d];
  const width = dataRow?.length ?? -1;
  let header: string[] | null = null;
  let headerLine: number | null = null;
  let headerFromComment = false;
  let titleEnd = Math.max(0, d - 1);
  if (d > 0) {
    let h = sample.lines[d - 1];
    header = splitHeaderFields(h.text, delimiter, width);
    // Some plotting programs export the units in a row of their own, right below the column names.
    const names = d > 1 ? splitHeaderFields(sample.lines[d - 2].text, delimiter, header.length) : [];
    if (isUnitsRow(header) && names.length === header.length) {
      const units = header;
      header = names.map((name, j) => (units[j] ? `${name} (${units[j].replace(/^[([](.*)[)\]]$/, "$1")})` : name));
      warnings.push(`units taken from the row below the column names (line ${h.line})`);
      h = sample.lines[d - 2];
      titleEnd = d - 2;
    }
    headerLine = h.line;
    if (header.length === width + 1 && header[header.length - 1] === "") {
      header.pop();
      warnings.push("trailing delimiter after the last header name ignored");
    }
  } else if (dataRow && !forcedMatrix && lastPreamble && isCommentLine(lastPreamble.text) && lastPreamble.next === sample.lines[0].start) {
    const fields = splitHeaderFields(stripComment(lastPreamble.text), delimiter, width);
    const plausible = fields.length === width && fields.every((f) => f !== "" && !isNumericCell(f, comma));
    if (plausible && !/[:=]/.test(stripComment(lastPreamble.text))) {
      header = fields;
      headerLine = lastPreamble.line;
      headerFromComment = true;
      warnings.push(`column names taken from the comment on line ${lastPreamble.line}`);
    }
  }
  // With a header the scan starts right below it, so a TSV row of empty cells ("\t\t") that the
  // line sampler took for blank is still read as a row of missing values.
  const below = d > 0 ? sample.lines[d - 1] : null;
  const dataStart = below ? below.next : sample.lines[0].start;
  const dataLine = below ? below.line + 1 : sample.lines[0].line;
  // Title lines and comments above the header (or the first row) belong to the header block;
  // comments between the header and the first row are counted by the scan instead.
  const above = [...sample.lines.slice(0, titleEnd), ...sample.comments.filter((c) => c.line < dataLine)];
  above.sort((a, b) => a.line - b.line);
  for (const l of above) headerLines.push(l.text);
  blankLines += sample.blanks.filter((b) => b < dataLine).length;
  const metadata: Record<string, string> = {};
  collectMetadata(headerLines, metadata);

  const columnCount = header ? header.length : width;
  const dataRows = rows.slice(d);
  const types = inferTypes(dataRows, columnCount, comma);
  const auto = (opts.format ?? "auto") === "auto";
  const isMatrix = forcedMatrix || (auto && header === null && columnCount >= MATRIX_MIN_COLUMNS && dataRows.length >= 2 && allNumeric(dataRows, comma));
  const dataChars = sample.lines.slice(d).reduce((s, l) => s + (l.next - l.start), 0);
  if (choice.decimalDetected && comma) warnings.push("decimal comma detected");
  return {
    delimiter,
    decimal,
    decimalDetected: choice.decimalDetected,
    headerLines,
    metadata,
    header,
    headerLine,
    headerFromComment,
    dataStart,
    dataLine,
    columnCount,
    types: isMatrix ? types.map(() => "number") : types,
    isMatrix,
    blankLines,
    avgLineLength: dataRows.length > 0 ? Math.max(1, dataChars / dataRows.length) : 16,
    warnings,
  };
}

/** Every cell empty or a known unit (`us`, `[mT]`, `(kcps)`), and at least one unit. */
function isUnitsRow(cells: string[]): boolean {
  const units = cells.map((c) => c.replace(/^[([](.*)[)\]]$/, "$1").trim());
  return units.some((u) => u !== "") && units.every((u) => u === "" || resolveUnit(u) !== null);
}

/** A column is text when most of its non-missing sample cells are text. */
function inferTypes(rows: string[][], count: number, comma: boolean): ColumnType[] {
  const num = new Array<number>(count).fill(0);
  const txt = new Array<number>(count).fill(0);
  for (const r of rows) {
    if (r.length !== count) continue;
    for (let j = 0; j < count; j++) {
      if (isNumericCell(r[j], comma)) num[j]++;
      else if (!isMissingCell(r[j])) txt[j]++;
    }
  }
  return num.map((n, j) => (txt[j] > n ? "string" : "number"));
}

/** Every cell numeric or missing; the top-left cell may be a label such as "y\x". */
function allNumeric(rows: string[][], comma: boolean): boolean {
  return rows.every((r, i) => r.every((f, j) => (i === 0 && j === 0) || isNumericCell(f, comma) || isMissingCell(f)));
}
