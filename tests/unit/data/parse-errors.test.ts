import { describe, expect, it } from "vitest";
import { parseTable } from "@/lib/data/parse";
import { expectParseError, parse, utf8 } from "./helpers";

const bytes = (...b: number[]) => new Uint8Array(b);

describe("validation errors carry code, status and location", () => {
  it("empty file, blank file, comments only, header only", () => {
    expectParseError(() => parseTable(new Uint8Array(0), { fileName: "a.csv" }), { code: "empty", httpStatus: 422, fileName: "a.csv" });
    expectParseError(() => parse("\n  \n\n"), { code: "empty", httpStatus: 422 });
    const e = expectParseError(() => parse("# sample: D-17\n# nothing measured\n"), { code: "empty" });
    expect(e.message).toBe("data.csv: the file has only comment or header lines and no data.");
    expectParseError(() => parse("# c\ntime,counts\n"), { code: "empty", line: 2 });
  });

  it("binary content posing as text → 415", () => {
    const cases: Array<[Uint8Array, string]> = [
      [bytes(0x7f, 0x45, 0x4c, 0x46, 2, 1, 1, 0), "ELF"],
      [bytes(0x4d, 0x5a, 0x90, 0x00, 0x03, 0, 0, 0), "Windows executable"],
      [bytes(0x50, 0x4b, 0x03, 0x04, 0x14, 0, 0, 0), "ZIP"],
      [utf8("%PDF-1.7\n%âãÏÓ\n1 0 obj\n"), "PDF"],
      [utf8("x,y\n1,2\n\u0000\u0000\n"), "NUL"],
      [utf8(`x,y\n${"\u0001\u0002\u0003\u0004\u0005,1\n".repeat(20)}`), "control characters"],
    ];
    for (const [b, what] of cases) {
      const e = expectParseError(() => parseTable(b, { fileName: "run.csv" }), { code: "binary", httpStatus: 415 });
      expect(e.message).toContain(what);
      expect(e.message.startsWith("run.csv: this looks like")).toBe(true);
    }
    // A header that merely starts with MZ is text.
    expect(parse("MZ_pos,counts\n1,2\n").rowCount).toBe(1);
  });

  it("ragged rows → 422 with the line and the first extra or missing column", () => {
    const e = expectParseError(() => parse("a,b,c\n1,2,3\n4,5,6,7\n"), { code: "ragged", httpStatus: 422, line: 3, column: 4 });
    expect(e.message).toBe("data.csv, line 3, column 4: this row has 4 values, but the header on line 1 names 3 columns.");
    expectParseError(() => parse("# c\n\na b c\n1 2 3\n\n4 5\n", "x.txt"), { code: "ragged", line: 6, column: 3 });
    expectParseError(() => parse("1,2\n3,4\n5\n"), { code: "ragged", line: 3, column: 2 });
  });

  it("a text cell in a numeric column → 422 with line, column and name", () => {
    const rows = Array.from({ length: 1300 }, (_, i) => `${i};${i % 7},5`);
    rows[1205] = "1205;12,5x";
    const text = `t;counts\n${rows.join("\n")}\n`;
    const e = expectParseError(() => parse(text), { code: "non_numeric", httpStatus: 422, line: 1207, column: 2, columnName: "counts" });
    expect(e.message).toBe('data.csv, line 1207, column 2 ("counts"): "12,5x" is not a number; the rest of this column is numeric.');
  });

  it("names a decimal comma in a decimal-point file, and counts further bad cells", () => {
    const e = expectParseError(() => parse('x,y\n1,2.5\n2,"3,5"\n3,4.5\n4,oops\n5,1\n6,2\n'), { code: "non_numeric", line: 3, column: 2 });
    expect(e.message).toContain("decimal comma");
    expect(e.message).toContain("apart from 1 more such cell");
  });

  it("a mostly-text column is a string column, but one numeric column is required", () => {
    expect(parse("name,v\nalpha,1\nbeta,2\n").columns[0].type).toBe("string");
    const e = expectParseError(() => parse("name,comment\nalpha,ok\nbeta,fine\n"), { code: "no_numeric_column", httpStatus: 422 });
    expect(e.message).toBe('data.csv: none of the 2 columns ("name", "comment") holds numbers; at least one numeric column is needed.');
  });

  it("duplicate and empty headers → 422 at the header cell", () => {
    const d = expectParseError(() => parse("# x\ntime (s),counts,time (ms)\n1,2,3\n"), { code: "duplicate_header", httpStatus: 422, line: 2, column: 3 });
    expect(d.message).toBe(
      'data.csv, line 2, column 3 ("time (ms)"): the column name "time" is already used by column 1 (from "time (s)"); every column needs its own name.',
    );
    expectParseError(() => parse("a,a\n1,2\n"), { code: "duplicate_header", column: 2 });
    const e = expectParseError(() => parse("a,,c\n1,2,3\n"), { code: "empty_header", line: 1, column: 2 });
    expect(e.message).toBe("data.csv, line 1, column 2: this column has no name; give every column a header (or remove the header line if there is none).");
    expectParseError(() => parse("a,b,\n1,2,3\n"), { code: "empty_header", line: 1, column: 3 });
    expectParseError(() => parse('[{"": 1}]', "a.json"), { code: "empty_header" });
  });

  it("too many columns → 422, with a configurable limit", () => {
    const header = Array.from({ length: 6 }, (_, j) => `c${j}`).join(",");
    const e = expectParseError(() => parse(`${header}\n1,2,3,4,5,6\n`, "w.csv", { maxColumns: 5 }), { code: "too_many_columns", httpStatus: 422, line: 1 });
    expect(e.message).toBe("w.csv, line 1: 6 columns is more than the limit of 5.");
    const wide = Array.from({ length: 10_001 }, (_, j) => j).join(",");
    expectParseError(() => parse(`${wide}\n${wide}\n`), { code: "too_many_columns" });
  });

  it("bad JSON → 400 with line and column of the problem", () => {
    const e = expectParseError(() => parse('[\n  {"t": 1, "y": 2},\n  {"t": 2 "y": 3}\n]', "r.json"), {
      code: "bad_json",
      httpStatus: 400,
      line: 3,
      column: 11,
    });
    expect(e.message).toBe('r.json, line 3, column 11: the JSON is malformed: unexpected "\\"" (expected "," or "}").');
    expectParseError(() => parse('{"a": [1, 2', "r.json"), { code: "bad_json", line: 1, column: 12 });
    expectParseError(() => parse('{"a": "x\ny"}', "r.json"), { code: "bad_json", line: 1, column: 9 });
    expectParseError(() => parse('"just a string"', "r.json"), { code: "bad_json", httpStatus: 400 });
  });

  it("JSON cells that are not numbers point at the value in the file", () => {
    const e = expectParseError(() => parse('{"columns": ["t", "y"],\n "rows": [[1, 2],\n  [2, "n/a?"],\n  [3, 4], [4, 5]]}', "r.json"), {
      code: "non_numeric",
      line: 3,
      column: 7,
      columnName: "y",
    });
    expect(e.message).toBe('r.json, line 3, column 7 ("y"): row 2 holds "n/a?", which is not a number; the rest of this column is numeric.');
    expectParseError(() => parse('{"columns": ["t", "y"], "rows": [[1, 2], [3]]}', "r.json"), { code: "ragged", line: 1, column: 42 });
  });

  it("broken UTF-16 and UTF-32 → 415 encoding", () => {
    expectParseError(() => parseTable(bytes(0xff, 0xfe, 0x41, 0x00, 0x42), { fileName: "u.txt" }), { code: "encoding", httpStatus: 415 });
    expectParseError(() => parseTable(bytes(0xff, 0xfe, 0x00, 0xd8, 0x41, 0x00), { fileName: "u.txt" }), { code: "encoding" });
    expectParseError(() => parseTable(bytes(0xef, 0xbb, 0xbf, 0x61, 0xff, 0x0a), { fileName: "u.txt" }), { code: "encoding" });
  });
});
