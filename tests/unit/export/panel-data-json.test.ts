import { strFromU8 } from "fflate";
import { describe, expect, it } from "vitest";
import { tableOf, tableOfRows } from "@/lib/data/table-rows";
import { panelDataJson } from "@/lib/server/export/panel-data-json";
import { joinBlocks } from "@/lib/server/export/utf8-chunks";

describe("a panel's data file in the bundle", () => {
  it("is byte for byte what JSON.stringify writes for the same rows, without an object per row", () => {
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
    // The same content written out by hand as records, missing numbers as null.
    const expected = {
      panel: "a",
      revision: 3,
      contentHash: "ab12",
      data: {
        echo: {
          file: "derived/x.csv",
          fit: "fits/e.json",
          output: "data",
          rows: [
            { tau: 0.5, S: 1, series: "data" },
            { tau: 0, S: 0.25, series: "data" },
            { tau: 2e-7, S: null, series: "data" },
          ],
        },
        raw: {
          file: "raw/y.csv",
          rows: [
            { tau: 0.5, S: 1, series: "data" },
            { tau: 1, S: null, series: "curve" },
            { tau: 0, S: 0.25, series: "data" },
            { tau: 2e-7, S: null, series: "data" },
          ],
        },
        p: { file: "derived/x.csv", fit: "fits/e.json", output: "parameters", rows: params },
        empty: { file: "raw/z.csv", rows: [] },
      },
    };
    expect(strFromU8(joinBlocks(out))).toBe(JSON.stringify(expected) + "\n");
  });
});
