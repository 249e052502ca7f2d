import { expect } from "vitest";
import { ParseError, parseTable, type ParsedTable, type ParseOptions } from "@/lib/data/parse";

export const utf8 = (s: string): Uint8Array => new TextEncoder().encode(s);

export function parse(text: string, fileName = "data.csv", opts: Partial<ParseOptions> = {}): ParsedTable {
  return parseTable(utf8(text), { fileName, ...opts });
}

/** Column by name as a plain array (numbers or strings). */
export function col(t: ParsedTable, name: string): Array<number | string> {
  const j = t.columns.findIndex((c) => c.name === name);
  if (j < 0) throw new Error(`no column ${name}; have ${t.columns.map((c) => c.name).join(", ")}`);
  return Array.from(t.data[j] as ArrayLike<number | string>);
}

export function catchParse(run: () => unknown): ParseError {
  try {
    run();
  } catch (e) {
    expect(e).toBeInstanceOf(ParseError);
    return e as ParseError;
  }
  throw new Error("expected a ParseError, but parsing succeeded");
}

export function expectParseError(
  run: () => unknown,
  want: Partial<Pick<ParseError, "code" | "httpStatus" | "line" | "column" | "columnName" | "fileName">>,
): ParseError {
  const e = catchParse(run);
  expect({ code: e.code, httpStatus: e.httpStatus, line: e.line, column: e.column, columnName: e.columnName, fileName: e.fileName }).toMatchObject(want);
  return e;
}
