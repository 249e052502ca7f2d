import { describe, expect, it } from "vitest";
import { decodeColumnar, encodeColumnar, readColumnarHeader, readRows } from "@/lib/data/columnar";
import type { ParsedTable } from "@/lib/data/parse";
import { parse } from "./helpers";

describe("columnar cache", () => {
  it("round-trips a table with numbers, NaN, -0 and strings (including non-ASCII and emoji)", () => {
    const t = parse('label,B (mT),note\nA,1.5,"µ-wave"\nB,,"é 🧪"\nC,-0,\n', "x.csv");
    const blob = encodeColumnar(t);
    const back = decodeColumnar(blob);
    expect(back.columns).toEqual(t.columns);
    expect(back.data[0]).toEqual(["A", "B", "C"]);
    expect(back.data[2]).toEqual(["µ-wave", "é 🧪", ""]);
    const b = back.data[1] as Float64Array;
    expect(b).toBeInstanceOf(Float64Array);
    expect(b[0]).toBe(1.5);
    expect(Number.isNaN(b[1])).toBe(true);
    expect(Object.is(b[2], -0)).toBe(true);
    const { data: _a, ...restA } = t;
    const { data: _b, ...restB } = back;
    expect(restB).toEqual(restA);
  });

  it("reads the header without the data, and pages a million rows from the middle", () => {
    const n = 1_000_000;
    const x = new Float64Array(n).map((_, i) => i * 0.5);
    const tags = Array.from({ length: n }, (_, i) => `r${i}`);
    const t: ParsedTable = {
      format: "csv",
      encoding: "utf-8",
      delimiter: ",",
      decimal: ".",
      columns: [
        { name: "x", unit: "µs", type: "number", sourceHeader: "x (us)" },
        { name: "tag", unit: null, type: "string", sourceHeader: "tag" },
      ],
      data: [x, tags],
      rowCount: n,
      headerLines: ["# big"],
      metadata: { k: "v" },
      warnings: [],
    };
    const blob = encodeColumnar(t);
    expect(blob.byteLength).toBeLessThan(8 * n + 4 * (n + 1) + 8 * n + 1024);
    expect(readColumnarHeader(blob)).toMatchObject({ rowCount: n, metadata: { k: "v" }, headerLines: ["# big"] });
    const page = readRows(blob, 900_000, 100);
    expect(page).toMatchObject({ rowCount: n, offset: 900_000, length: 100 });
    expect(Array.from(page.data[0] as Float64Array).slice(0, 3)).toEqual([450_000, 450_000.5, 450_001]);
    expect((page.data[1] as string[])[99]).toBe("r900099");
  });

  it("clamps pages to the table and works from an unaligned copy", () => {
    const t = parse("a,b\n1,x\n2,y\n3,z\n");
    const blob = encodeColumnar(t);
    const shifted = new Uint8Array(blob.length + 3);
    shifted.set(blob, 3);
    const view = shifted.subarray(3);
    expect(readRows(view, 2, 10)).toMatchObject({ offset: 2, length: 1, data: [new Float64Array([3]), ["z"]] });
    expect(readRows(view, 10, 10).length).toBe(0);
    expect(readRows(view, -5, 1).data[1]).toEqual(["x"]);
    expect(() => decodeColumnar(new Uint8Array([1, 2, 3, 4, 0, 0, 0, 0]))).toThrow(/not a Prooflight columnar blob/);
  });
});
