import { describe, expect, it } from "vitest";
import { strFromU8 } from "fflate";
import { tableOfRows } from "@/lib/data/table-rows";
import { csvCell, tableToCsv } from "@/lib/server/export/source-data";
import { joinBlocks } from "@/lib/server/export/utf8-chunks";

describe("source-data CSV cells", () => {
  it("writes formula-looking text inert and numbers as they are", () => {
    expect(["=cmd|' /C calc'!A0", "+1", "-x", "@SUM(A1)", "\tTab", "plain", "a,b", 'say "hi"'].map(csvCell)).toEqual([
      "'=cmd|' /C calc'!A0",
      "'+1",
      "'-x",
      "'@SUM(A1)",
      "'\tTab",
      "plain",
      '"a,b"',
      '"say ""hi"""',
    ]);
    expect([-0.5, 1e-9, 0, null, undefined].map(csvCell)).toEqual(["-0.5", "1e-9", "0", "", ""]);
    expect(strFromU8(joinBlocks(tableToCsv(tableOfRows([{ t: -1, note: "=1+1" }]))))).toBe("t,note\n-1,'=1+1\n");
    expect(strFromU8(joinBlocks(tableToCsv(tableOfRows([{ tau: 2, x: null }]), { tau: "µs" })))).toBe("tau (µs),x\n2,\n");
  });
});
