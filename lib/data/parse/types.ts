/** Shapes shared by every reader in the parsing layer (pure data, no I/O). */

export type ColumnType = "number" | "string";

export type TableFormat = "csv" | "tsv" | "text" | "json" | "matrix";
export type TextEncodingName = "utf-8" | "utf-8-bom" | "utf-16le" | "utf-16be" | "latin-1";
export type DelimiterOption = "," | ";" | "\t" | "whitespace";
export type DecimalMark = "." | ",";

export interface ParsedColumn {
  /** Quantity name without the unit, e.g. "time" for `time (µs)`. */
  name: string;
  /** Normalised unit symbol as written (µs, MHz, mT …), or null when the header names none. */
  unit: string | null;
  type: ColumnType;
  /** The header cell exactly as found in the file (trimmed, quotes removed). */
  sourceHeader: string;
}

export interface ParsedTable {
  format: TableFormat;
  encoding: TextEncodingName;
  /** "," ";" "\t" or "whitespace"; null for JSON. */
  delimiter: string | null;
  decimal: DecimalMark;
  columns: ParsedColumn[];
  /** Column-major; numeric columns are Float64Array with NaN for missing cells. */
  data: Array<Float64Array | string[]>;
  rowCount: number;
  /** Comment / header block lines as they appear in the file, e.g. "# sample: D-17". */
  headerLines: string[];
  /** key: value pairs found in the header block. */
  metadata: Record<string, string>;
  warnings: string[];
}

export interface ParseOptions {
  fileName: string;
  delimiter?: DelimiterOption;
  decimal?: DecimalMark;
  format?: "auto" | "csv" | "tsv" | "text" | "json" | "matrix";
  /** Upper bound on the number of columns (default 10,000). */
  maxColumns?: number;
}

export const DEFAULT_MAX_COLUMNS = 10_000;
