import { describe, expect, it } from "vitest";
import { ParseError, parseTable } from "@/lib/data/parse";

const parse = (text: string) => parseTable(new TextEncoder().encode(text), { fileName: "deep.json" });

function parseError(text: string): ParseError {
  try {
    parse(text);
  } catch (e) {
    if (e instanceof ParseError) return e;
    throw e;
  }
  throw new Error("expected a ParseError");
}

describe("JSON uploads nested too deeply", () => {
  it("a cell nested 10,000 levels deep is a 400 ParseError naming line, column and the limit", () => {
    const e = parseError(`{"t": [1, 2], "y": [${"[".repeat(10_000)}${"]".repeat(10_000)}, 1]}`);
    expect(e.httpStatus).toBe(400);
    expect(e.code).toBe("bad_json");
    expect(e.message).toBe("deep.json, line 1, column 83: the JSON nests arrays and objects more than 64 levels deep.");
    expect([e.line, e.column]).toEqual([1, 83]);
  });

  it("finds the place on a later line", () => {
    const e = parseError(`[\n  {"t": 1, "y": 2},\n  {"t": 2, "y": ${'{"a":'.repeat(70)}1${"}".repeat(70)}}\n]`);
    // Level 1 is the array, 2 the record, 3 the first {"a": …} at column 17; level 65 is 62 openers later.
    expect(e.message).toBe(`deep.json, line 3, column ${17 + 62 * 5}: the JSON nests arrays and objects more than 64 levels deep.`);
  });

  it("a cell holding a shallow object still reads as text", () => {
    const t = parse('[{"t": 1, "y": 2, "note": {"a": [1]}}, {"t": 2, "y": 3, "note": "x"}]');
    expect(t.columns.map((c) => [c.name, c.type])).toEqual([
      ["t", "number"],
      ["y", "number"],
      ["note", "string"],
    ]);
  });
});
