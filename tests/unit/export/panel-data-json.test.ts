import { strFromU8 } from "fflate";
import { describe, expect, it } from "vitest";
import { tableOf, tableOfRows } from "@/lib/data/table-rows";
import { panelDataJson } from "@/lib/server/export/panel-data-json";
import { joinBlocks } from "@/lib/server/export/utf8-chunks";

describe("a panel's data file in the bundle", () => {
  it("is byte for byte what JSON.stringify writes for the same columns, without an object per row", () => {
    const parsed = {
      columns: [{ name: "tau" }, { name: "S" }, { name: "series" }] as never,
      data: [new Float64Array([0.5, 1, -0, 2e-7]), new Float64Array([1, NaN, 0.25, Infinity]), ["data", "curve", "data", "data"]],
      rowCount: 4,
    };
    const params = [{ symbol: "T₂", value: 41.5, unit: "µs", note: 'say "hi"' }];
    const out = panelDataJson(
      { panel: "a", revision: 3, contentHash: "ab12" },
      {
        echo: { described: { file: "derived/x.csv", fit: "fits/e.json", output: "data" }, table: tableOf(parsed, "data") },
        raw: { described: { file: "raw/y.csv" }, table: tableOf(parsed) },
        p: { described: { file: "derived/x.csv", fit: "fits/e.json", output: "parameters" }, table: tableOfRows(params) },
        empty: { described: { file: "raw/z.csv" }, table: tableOfRows([]) },
      },
    );
    // The same content written out by hand, column by column, missing numbers as null.
    const expected = {
      panel: "a",
      revision: 3,
      contentHash: "ab12",
      data: {
        echo: {
          file: "derived/x.csv",
          fit: "fits/e.json",
          output: "data",
          columns: ["tau", "S", "series"],
          values: [
            [0.5, 0, 2e-7],
            [1, 0.25, null],
            ["data", "data", "data"],
          ],
        },
        raw: {
          file: "raw/y.csv",
          columns: ["tau", "S", "series"],
          values: [
            [0.5, 1, 0, 2e-7],
            [1, null, 0.25, null],
            ["data", "curve", "data", "data"],
          ],
        },
        p: {
          file: "derived/x.csv",
          fit: "fits/e.json",
          output: "parameters",
          columns: ["symbol", "value", "unit", "note"],
          values: [["T₂"], [41.5], ["µs"], ['say "hi"']],
        },
        empty: { file: "raw/z.csv", columns: [], values: [] },
      },
    };
    expect(strFromU8(joinBlocks(out))).toBe(JSON.stringify(expected) + "\n");
  });
});
