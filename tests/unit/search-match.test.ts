import { describe, expect, it } from "vitest";
import { matchesQuery } from "@/lib/data/search-match";

describe("matchesQuery", () => {
  const texts = ["Echo NV-7", "hahn_echo", "sample B-12", "depth=shallow"];
  it("matches everything on an empty query", () => {
    expect(matchesQuery("  ", texts)).toBe(true);
  });
  it("needs every word, in any of the texts, case ignored", () => {
    expect(matchesQuery("nv-7 SHALLOW", texts)).toBe(true);
    expect(matchesQuery("nv-7 deep", texts)).toBe(false);
  });
  it("ignores accents", () => {
    expect(matchesQuery("resume", ["Résumé"])).toBe(true);
  });
});
