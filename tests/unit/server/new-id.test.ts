import { describe, expect, it } from "vitest";
import { newId } from "@/lib/server/crypto";

describe("newId", () => {
  it("gives 16 base64url characters (96 bits), all different, across many refills of its pool", () => {
    const ids = Array.from({ length: 10_000 }, () => newId());
    for (const id of ids) expect(id).toMatch(/^[A-Za-z0-9_-]{16}$/);
    expect(new Set(ids).size).toBe(10_000);
  });

  it("uses the whole alphabet evenly enough to be random: each of the 64 characters appears", () => {
    const seen = new Set(Array.from({ length: 2_000 }, () => newId()).join(""));
    expect(seen.size).toBe(64);
  });
});
