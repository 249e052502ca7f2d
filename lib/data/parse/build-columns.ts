/** Header cells → ParsedColumn, with the checks a plotted column name must pass. */
import type { ColumnType, ParsedColumn } from "./types";
import { fail, quote } from "./parse-error";
import { parseHeaderUnit } from "../units";

export interface HeaderCheck {
  fileName: string;
  line?: number;
  /** The last header cell may be empty: a trailing delimiter, dropped later if its column is empty. */
  allowEmptyLast?: boolean;
}

/** Fails on empty or repeated names (after the unit is split off: `time (s)` and `time (ms)` clash). */
export function checkHeader(header: string[], check: HeaderCheck): void {
  const seen = new Map<string, number>();
  header.forEach((cell, j) => {
    const loc = { line: check.line, column: j + 1 };
    if (cell.trim() === "") {
      if (check.allowEmptyLast && j === header.length - 1) return;
      fail("empty_header", check.fileName, loc, "this column has no name; give every column a header (or remove the header line if there is none).");
    }
    const name = parseHeaderUnit(cell).name;
    const first = seen.get(name);
    if (first !== undefined) {
      const same = header[first] === cell ? "" : ` (from ${quote(header[first])})`;
      fail(
        "duplicate_header",
        check.fileName,
        { ...loc, columnName: cell },
        `the column name ${quote(name)} is already used by column ${first + 1}${same}; every column needs its own name.`,
      );
    }
    seen.set(name, j);
  });
}

export function buildColumns(header: string[] | null, types: ColumnType[]): ParsedColumn[] {
  return types.map((type, j) => {
    if (!header) return { name: `col${j + 1}`, unit: null, type, sourceHeader: "" };
    const { name, unit } = parseHeaderUnit(header[j]);
    return { name, unit, type, sourceHeader: header[j] };
  });
}
