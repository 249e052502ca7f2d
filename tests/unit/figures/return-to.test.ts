import { describe, expect, it } from "vitest";
import { returnWithRun, safeReturnTo } from "@/lib/figures/return-to";

describe("safeReturnTo", () => {
  it("accepts a panel page of this site, with its query", () => {
    expect(safeReturnTo("/panels/p1?tab=builder&version=v9")).toBe("/panels/p1?tab=builder&version=v9");
    expect(safeReturnTo("/panels/abc_DEF-12")).toBe("/panels/abc_DEF-12");
  });
  it("refuses other sites, other pages and odd paths", () => {
    expect(safeReturnTo("https://example.com/panels/p1")).toBeNull();
    expect(safeReturnTo("//example.com/panels/p1")).toBeNull();
    expect(safeReturnTo("/datasets/d1")).toBeNull();
    expect(safeReturnTo("/panels/../settings")).toBeNull();
    expect(safeReturnTo("/panels/p1?x=\\evil")).toBeNull();
    expect(safeReturnTo(null)).toBeNull();
  });
});

describe("returnWithRun", () => {
  it("adds the run to the query", () => {
    expect(returnWithRun("/panels/p1?tab=builder&version=v9", "a7")).toBe("/panels/p1?tab=builder&version=v9&bind=a7");
  });
  it("replaces a run named before and starts a query when there is none", () => {
    expect(returnWithRun("/panels/p1?bind=old", "a7")).toBe("/panels/p1?bind=a7");
    expect(returnWithRun("/panels/p1", "a7")).toBe("/panels/p1?bind=a7");
  });
});
