/** Delimited text (CSV, TSV, whitespace text, numeric matrices) → ParsedTable. */
import type { ColumnType, ParsedColumn, ParsedTable, ParseOptions, TableFormat } from "./types";
import { DEFAULT_MAX_COLUMNS } from "./types";
import type { DecodedText } from "./decode-bytes";
import { detectLayout, type Layout } from "./detect-layout";
import { scanDelimited, type ScanResult } from "./scan-delimited";
import { buildColumns, checkHeader } from "./build-columns";
import { detectAxes, matrixToLong } from "./matrix";
import { formatCount } from "../format";
import { fail, quote } from "./parse-error";
import { parseCell } from "./parse-cell";

function plural(n: number, word: string): string {
  return `${formatCount(n)} ${word}${n === 1 ? "" : "s"}`;
}

function scan(text: string, layout: Layout, types: ColumnType[]): ScanResult {
  const estimate = (text.length - layout.dataStart) / layout.avgLineLength;
  return scanDelimited({
    text,
    start: layout.dataStart,
    line: layout.dataLine,
    delimiter: layout.delimiter,
    decimal: layout.decimal,
    types,
    capacityHint: estimate * 1.02 + 16,
  });
}

export function parseDelimited(decoded: DecodedText, opts: ParseOptions): ParsedTable {
  const { fileName } = opts;
  const { text } = decoded;
  const layout = detectLayout(text, opts);
  const maxColumns = opts.maxColumns ?? DEFAULT_MAX_COLUMNS;
  if (layout.columnCount > maxColumns) {
    fail(
      "too_many_columns",
      fileName,
      { line: layout.headerLine ?? layout.dataLine },
      `${formatCount(layout.columnCount)} columns is more than the limit of ${formatCount(maxColumns)}.`,
    );
  }
  if (layout.header) checkHeader(layout.header, { fileName, line: layout.headerLine ?? undefined, allowEmptyLast: true });

  let types = layout.types;
  let result = scan(text, layout, types);
  if (result.unclosedQuote) {
    fail(
      "unclosed_quote",
      fileName,
      { line: result.unclosedQuote.line, column: result.unclosedQuote.column },
      'a quoted field opens here and is never closed, so the rest of the file would become one cell; close the quote (write "" for a quote inside a field).',
    );
  }
  if (result.ragged) raggedError(fileName, layout, result.ragged);
  if (result.rowCount === 0) fail("empty", fileName, { line: layout.headerLine ?? undefined }, "the file has a header but no data rows.");
  // The sample guessed "number" for a column that is mostly text further down: read it again as text.
  if (!layout.isMatrix) {
    const revised = types.map((t, j) => {
      const st = result.stats[j];
      return t === "number" && st.bad > result.rowCount - st.missing - st.bad ? "string" : t;
    });
    if (revised.some((t, j) => t !== types[j])) {
      types = revised;
      result = scan(text, layout, types);
    }
  }
  const cornerIsLabel = layout.isMatrix && result.stats[0].bad === 1 && result.stats[0].firstBadRow === 0;
  result.stats.forEach((st, j) => {
    if (types[j] !== "number" || st.bad === 0 || (cornerIsLabel && j === 0)) return;
    nonNumericError(fileName, layout, j, st.firstBadLine, st.firstBadValue, st.bad);
  });

  let columns = buildColumns(layout.header, types);
  let data = result.data;
  const warnings = [...decoded.warnings, ...layout.warnings];
  const last = columns.length - 1;
  if (layout.header && layout.header[last] === "") {
    const lastCol = data[last];
    if (!(lastCol instanceof Float64Array && result.stats[last].missing === result.rowCount)) {
      fail(
        "empty_header",
        fileName,
        { line: layout.headerLine ?? undefined, column: last + 1 },
        "this column has no name; give every column a header (or remove the header line if there is none).",
      );
    }
    columns = columns.slice(0, last);
    data = data.slice(0, last);
    warnings.push("empty last column (a delimiter at the end of every line) ignored");
  }
  if (!columns.some((c) => c.type === "number")) {
    const names = columns
      .slice(0, 5)
      .map((c) => quote(c.sourceHeader || c.name))
      .join(", ");
    fail(
      "no_numeric_column",
      fileName,
      {},
      `none of the ${plural(columns.length, "column")} (${names}${columns.length > 5 ? ", …" : ""}) holds numbers; at least one numeric column is needed.`,
    );
  }

  const blank = layout.blankLines + result.blankLines;
  if (blank > 0) warnings.push(`${plural(blank, "blank line")} skipped`);
  if (result.commentLines > 0) warnings.push(`${plural(result.commentLines, "comment line")} inside the data skipped`);

  let rowCount = result.rowCount;
  let format: TableFormat = layout.delimiter === "\t" ? "tsv" : layout.delimiter === "whitespace" ? "text" : "csv";
  if (layout.isMatrix) {
    const cols = data as Float64Array[];
    const hasAxes = detectAxes(cols, rowCount, cornerIsLabel);
    const long = matrixToLong(cols, rowCount, hasAxes);
    const axisNote = hasAxes ? "with its axis row and axis column" : "without axes (x, y are column and row indices from 0)";
    warnings.push(`2-D map of ${long.width} × ${long.height} read as long format (x, y, value) ${axisNote}`);
    columns = ["x", "y", "value"].map((name): ParsedColumn => ({ name, unit: null, type: "number", sourceHeader: name }));
    data = [long.x, long.y, long.value];
    rowCount = long.x.length;
    format = "matrix";
    const missing = long.value.reduce((s, v) => (Number.isNaN(v) ? s + 1 : s), 0);
    if (missing > 0) warnings.push(`${plural(missing, "missing cell")} in the map read as NaN`);
  } else {
    columns.forEach((c, j) => {
      const missing = result.stats[j].missing;
      if (c.type === "number" && missing > 0) warnings.push(`${plural(missing, "missing cell")} in column ${quote(c.name)} read as NaN`);
    });
  }
  return {
    format,
    encoding: decoded.encoding,
    delimiter: layout.delimiter,
    decimal: layout.decimal,
    columns,
    data,
    rowCount,
    headerLines: layout.headerLines,
    metadata: layout.metadata,
    warnings,
  };
}

function raggedError(fileName: string, layout: Layout, ragged: { line: number; found: number }): never {
  const expected = layout.columnCount;
  const reference = layout.header
    ? `the header on line ${layout.headerLine} names ${plural(expected, "column")}`
    : `the first data row (line ${layout.dataLine}) has ${plural(expected, "value")}`;
  const column = ragged.found > expected ? expected + 1 : ragged.found + 1;
  fail("ragged", fileName, { line: ragged.line, column }, `this row has ${plural(ragged.found, "value")}, but ${reference}.`);
}

function nonNumericError(fileName: string, layout: Layout, j: number, line: number, value: string, count: number): never {
  const columnName = layout.header ? layout.header[j] : `col${j + 1}`;
  let why = `${quote(value)} is not a number`;
  if (layout.decimal === "." && parseCell(value, true) !== undefined) why += " (it has a decimal comma, the rest of the file a decimal point)";
  if (layout.decimal === "," && parseCell(value, false) !== undefined) why += " (it has a decimal point, the rest of the file a decimal comma)";
  const more = count > 1 ? ` apart from ${plural(count - 1, "more such cell")}` : "";
  fail("non_numeric", fileName, { line, column: j + 1, columnName }, `${why}; the rest of this column is numeric${more}.`);
}
