import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { ParseError, parseTable, type ParsedTable, type ParseOptions } from "@/lib/data/parse";
import { utf8 } from "./helpers";

/** The table is well-formed: one array per column, all of rowCount length, at least one numeric column. */
function checkTable(t: ParsedTable): void {
  expect(t.data.length).toBe(t.columns.length);
  t.columns.forEach((c, j) => {
    const d = t.data[j];
    expect(d.length).toBe(t.rowCount);
    expect(c.type === "number" ? d instanceof Float64Array : Array.isArray(d)).toBe(true);
  });
  expect(t.columns.some((c) => c.type === "number")).toBe(true);
  expect(new Set(t.columns.map((c) => c.name)).size).toBe(t.columns.length);
}

/** Either a well-formed table or a ParseError with a sensible status — never any other throw. */
function tableOrParseError(bytes: Uint8Array, opts: ParseOptions): void {
  let table: ParsedTable;
  try {
    table = parseTable(bytes, opts);
  } catch (e) {
    if (!(e instanceof ParseError)) throw e;
    expect([400, 415, 422]).toContain(e.httpStatus);
    expect(e.message.startsWith(opts.fileName)).toBe(true);
    return;
  }
  checkTable(table);
}

const fileNames = fc.constantFrom("a.csv", "a.tsv", "a.txt", "a.dat", "a.json", "noext");
const options = fc.record(
  {
    fileName: fileNames,
    delimiter: fc.constantFrom(",", ";", "\t", "whitespace") as fc.Arbitrary<"," | ";" | "\t" | "whitespace">,
    decimal: fc.constantFrom(".", ",") as fc.Arbitrary<"." | ",">,
    format: fc.constantFrom("auto", "csv", "tsv", "text", "json", "matrix") as fc.Arbitrary<ParseOptions["format"]>,
    maxColumns: fc.integer({ min: 1, max: 20 }),
  },
  { requiredKeys: ["fileName"] },
);

const csvToken = fc.oneof(
  { weight: 6, arbitrary: fc.constantFrom("0", "1", "2", "7", "9", "12.5", "-3", "1e3", "2,5", ".5", "1e", "NaN", "inf") },
  { weight: 4, arbitrary: fc.constantFrom(",", ";", "\t", " ", "  ", "\n", "\r\n", "\r") },
  { weight: 2, arbitrary: fc.constantFrom('"', '""', "#", "% ", ":", "=", "[x]", "(us)", "µ", "time", "a", "{", "[", "]", "}", "\u0000", "\u0001", "\ufeff") },
);
const csvLike = fc.array(csvToken, { maxLength: 120 }).map((t) => t.join(""));

describe("property: parseTable returns a table or throws ParseError", () => {
  it("random bytes (4,000 inputs)", () => {
    const bytes = fc.oneof(
      fc.uint8Array({ maxLength: 400 }),
      fc.uint8Array({ maxLength: 200 }).map((b) => new Uint8Array([0xff, 0xfe, ...b])),
      fc.uint8Array({ maxLength: 200 }).map((b) => new Uint8Array([0xef, 0xbb, 0xbf, ...b])),
      fc.uint8Array({ maxLength: 200, min: 0x20, max: 0x7e }),
    );
    fc.assert(
      fc.property(bytes, options, (b, o) => tableOrParseError(b, o)),
      { numRuns: 4000 },
    );
  });

  it("random CSV-like text (4,000 inputs)", () => {
    fc.assert(
      fc.property(csvLike, options, (s, o) => tableOrParseError(utf8(s), o)),
      { numRuns: 4000 },
    );
  });

  it("random and damaged JSON (3,000 inputs)", () => {
    const damaged = fc.tuple(fc.json(), fc.nat(), fc.constantFrom("", ",", "]", "}", '"', "x")).map(([j, k, c]) => {
      const at = j.length === 0 ? 0 : k % j.length;
      return j.slice(0, at) + c + j.slice(at + (c === "" ? 1 : 0));
    });
    const tables = fc
      .array(fc.dictionary(fc.constantFrom("t", "y", "z (us)", "__proto__", ""), fc.jsonValue({ maxDepth: 1 }), { maxKeys: 4 }), { maxLength: 8 })
      .map((a) => JSON.stringify(a));
    const text = fc.oneof(fc.json(), damaged, tables);
    fc.assert(
      fc.property(text, fileNames, (s, f) => tableOrParseError(utf8(s), { fileName: f.replace(/\.\w+$/, ".json") })),
      { numRuns: 3000 },
    );
  });
});

/** Numbers as a physicist's export would write them; NaN becomes an empty (or "NaN") cell. */
const cellValue = fc.oneof(
  { weight: 8, arbitrary: fc.double({ noNaN: true }) },
  { weight: 3, arbitrary: fc.integer({ min: -1_000_000, max: 1_000_000 }) },
  { weight: 3, arbitrary: fc.double({ min: -1e6, max: 1e6, noNaN: true }).map((v) => Number(v.toFixed(4))) },
  { weight: 1, arbitrary: fc.constant(NaN) },
);
const numericTable = fc
  .integer({ min: 1, max: 6 })
  .chain((cols) => fc.array(fc.array(cellValue, { minLength: cols, maxLength: cols }), { minLength: 1, maxLength: 40 }).map((rows) => ({ cols, rows })));

type Style = { delimiter: string; comma: boolean; missing: string; fileName: string };
const STYLES: Style[] = [
  { delimiter: ",", comma: false, missing: "", fileName: "rt.csv" },
  { delimiter: ";", comma: true, missing: "", fileName: "rt.csv" },
  { delimiter: "\t", comma: false, missing: "", fileName: "rt.tsv" },
  { delimiter: " ", comma: false, missing: "NaN", fileName: "rt.txt" },
  { delimiter: "\t", comma: true, missing: "NaN", fileName: "rt.txt" },
];

function writeTable(rows: number[][], cols: number, s: Style): string {
  const header = Array.from({ length: cols }, (_, j) => `c${j} (us)`).join(s.delimiter);
  const cell = (v: number) => (Number.isNaN(v) ? s.missing : s.comma ? String(v).replace(".", ",") : String(v));
  // A line of only empty cells in a one-column file is a blank line; write NaN there.
  const line = (r: number[]) => (cols === 1 && Number.isNaN(r[0]) ? "NaN" : r.map(cell).join(s.delimiter));
  return `${header}\n${rows.map(line).join("\n")}\n`;
}

describe("property: numbers → text → parse → the same numbers", () => {
  for (const style of STYLES) {
    const label = `${JSON.stringify(style.delimiter)}${style.comma ? " with decimal comma" : ""}`;
    it(`round-trips ${label} (400 tables)`, () => {
      fc.assert(
        fc.property(numericTable, ({ cols, rows }) => {
          const t = parseTable(utf8(writeTable(rows, cols, style)), { fileName: style.fileName });
          expect(t.rowCount).toBe(rows.length);
          expect(t.columns.map((c) => c.unit)).toEqual(Array(cols).fill("µs"));
          for (let j = 0; j < cols; j++) {
            const got = Array.from(t.data[j] as Float64Array);
            // String(-0) is "0", so compare against what the text says.
            expect(got).toEqual(rows.map((r) => (Number.isNaN(r[j]) ? NaN : Number(String(r[j])))));
          }
        }),
        { numRuns: 400 },
      );
    });
  }
});
