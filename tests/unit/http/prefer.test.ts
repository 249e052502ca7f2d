import { describe, expect, it } from "vitest";
import { prefersMinimal } from "@/lib/http/prefer";

const req = (prefer?: string) => new Request("http://localhost/api/x", { method: "POST", headers: prefer === undefined ? {} : { prefer } });

// Header grammar from RFC 7240 §2 (preferences, parameters, quoted values) and §4.2 (return=minimal).
describe("Prefer: return=minimal", () => {
  it.each([
    ["return=minimal", true],
    ['return="minimal"', true],
    ["RETURN=Minimal", true],
    ["respond-async, return=minimal; foo=bar", true],
    ["  return = minimal ", true],
    ["return=representation", false],
    ["handling=lenient", false],
    ["minimal", false],
    ["return=minimalist", false],
    ["", false],
  ])("%j → %s", (header, expected) => {
    expect(prefersMinimal(req(header))).toBe(expected);
  });

  it("no header asks for the whole resource", () => {
    expect(prefersMinimal(req())).toBe(false);
  });
});
