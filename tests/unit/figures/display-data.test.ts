import { describe, expect, it } from "vitest";
import { reduceForDisplay } from "@/lib/data/display-reduction";
import { tableOf, tableOfRows } from "@/lib/data/table-rows";

const reduceRowsForDisplay = (rows: Array<Record<string, number>>) => reduceForDisplay(tableOfRows(rows));

describe("rows reduced for display", () => {
  it("keeps short tables whole", () => {
    const rows = Array.from({ length: 100 }, (_, i) => ({ f: i, pl: 1 }));
    expect(reduceRowsForDisplay(rows)).toMatchObject({ reduced: false, sourceRows: 100 });
  });

  it("keeps a one-point ODMR dip in 200,000 rows and every column's extremes", () => {
    const rows = Array.from({ length: 200_000 }, (_, i) => ({ f: 2800 + i * 1e-3, pl: i === 123_457 ? 0.7 : 1 + 1e-4 * Math.sin(i), other: i === 5 ? 9 : 0 }));
    const r = reduceRowsForDisplay(rows);
    expect(r.reduced).toBe(true);
    expect(r.rows.length).toBeLessThanOrEqual(8002);
    expect(Math.min(...r.rows.map((x) => x.pl as number))).toBe(0.7);
    expect(Math.max(...r.rows.map((x) => x.other as number))).toBe(9);
    expect(r.rows.every((x, i) => i === 0 || (x.f as number) >= (r.rows[i - 1]!.f as number))).toBe(true);
  });

  it("reads a parsed table's columns directly, one series at a time, with missing numbers as null", () => {
    const table = {
      columns: [{ name: "x" }, { name: "y" }, { name: "series" }] as never,
      data: [new Float64Array([1, 2, 3, 4]), new Float64Array([10, NaN, 30, 40]), ["data", "curve", "data", "curve"]],
      rowCount: 4,
    };
    const curve = tableOf(table, "curve");
    expect(curve.length).toBe(2);
    expect(reduceForDisplay(curve).rows).toEqual([
      { x: 2, y: null, series: "curve" },
      { x: 4, y: 40, series: "curve" },
    ]);
    expect(tableOf(table).length).toBe(4);
  });
});
