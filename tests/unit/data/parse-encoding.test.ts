import { describe, expect, it } from "vitest";
import { parseTable } from "@/lib/data/parse";
import { col } from "./helpers";

const TEXT = "time (µs)\tcounts\n0,5\t12\n1,5\t10\n";

function utf16(s: string, bigEndian: boolean, bom = true): Uint8Array {
  const out = new Uint8Array((bom ? 2 : 0) + 2 * s.length);
  let p = 0;
  if (bom) {
    out[p++] = bigEndian ? 0xfe : 0xff;
    out[p++] = bigEndian ? 0xff : 0xfe;
  }
  for (let i = 0; i < s.length; i++) {
    const c = s.charCodeAt(i);
    out[p++] = bigEndian ? c >> 8 : c & 0xff;
    out[p++] = bigEndian ? c & 0xff : c >> 8;
  }
  return out;
}

function latin1(s: string): Uint8Array {
  return Uint8Array.from(s, (ch) => ch.charCodeAt(0));
}

function expectSameTable(bytes: Uint8Array, encoding: string) {
  const t = parseTable(bytes, { fileName: "enc.tsv" });
  expect(t.encoding).toBe(encoding);
  expect(t.columns[0]).toMatchObject({ name: "time", unit: "µs" });
  expect(col(t, "time")).toEqual([0.5, 1.5]);
  expect(col(t, "counts")).toEqual([12, 10]);
  return t;
}

describe("encodings", () => {
  it("UTF-8 with and without BOM", () => {
    expectSameTable(new TextEncoder().encode(TEXT), "utf-8");
    const withBom = new Uint8Array([0xef, 0xbb, 0xbf, ...new TextEncoder().encode(TEXT)]);
    const t = expectSameTable(withBom, "utf-8-bom");
    expect(t.columns[0].sourceHeader).toBe("time (µs)");
  });

  it("UTF-16 LE and BE with BOM", () => {
    expectSameTable(utf16(TEXT, false), "utf-16le");
    expectSameTable(utf16(TEXT, true), "utf-16be");
  });

  it("UTF-16 LE without BOM is recognised by its NUL pattern", () => {
    const t = expectSameTable(utf16(TEXT, false, false), "utf-16le");
    expect(t.warnings.some((w) => w.includes("UTF-16 LE"))).toBe(true);
  });

  it("falls back to Latin-1 when the bytes are not valid UTF-8 (µ is 0xB5)", () => {
    const bytes = latin1(TEXT);
    expect(bytes.includes(0xb5)).toBe(true);
    const t = expectSameTable(bytes, "latin-1");
    expect(t.warnings).toContain("not valid UTF-8; read as Latin-1 (Windows-1252)");
    const g = parseTable(latin1("T (°C);Ø\n1;2\n"), { fileName: "x.csv" });
    expect(g.columns.map((c) => c.sourceHeader)).toEqual(["T (°C)", "Ø"]);
  });

  it("treats u, µ (U+00B5) and μ (U+03BC) alike", () => {
    const t = parseTable(new TextEncoder().encode("a (us),b (\u00B5s),c (\u03BCs)\n1,2,3\n"), { fileName: "m.csv" });
    expect(t.columns.map((c) => c.unit)).toEqual(["µs", "µs", "µs"]);
  });
});
