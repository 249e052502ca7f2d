import { createHash } from "node:crypto";
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { CanonicalJsonError, canonicalJson, contentHash } from "@/lib/figures/canonical-spec";
import { sha256Hex } from "@/lib/figures/sha256";

/** An independent canonical form: keys sorted at every level, then the platform's JSON.stringify. */
function sortedStringify(v: unknown): string {
  const sort = (x: unknown): unknown =>
    Array.isArray(x)
      ? x.map(sort)
      : x && typeof x === "object"
        ? Object.fromEntries(
            Object.keys(x)
              .sort()
              .map((k) => [k, sort((x as Record<string, unknown>)[k])]),
          )
        : x;
  return JSON.stringify(sort(v));
}
import { sha256Hex as serverSha256 } from "@/lib/server/crypto";

const nodeSha = (s: string) => createHash("sha256").update(s, "utf8").digest("hex");

describe("sha256 (pure)", () => {
  it("matches the FIPS 180-4 examples", () => {
    expect(sha256Hex("")).toBe("e3b0c44298fc1c149afbf4c8996fb92427ae41e4649b934ca495991b7852b855");
    expect(sha256Hex("abc")).toBe("ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad");
    expect(sha256Hex("abcdbcdecdefdefgefghfghighijhijkijkljklmklmnlmnomnopnopq")).toBe("248d6a61d20638b8e5c026930c3e6039a33ce45964ff2167f6ecedd419db06c1");
  });

  it("agrees with node:crypto across block boundaries and non-ASCII text", () => {
    for (const n of [1, 55, 56, 57, 63, 64, 65, 119, 120, 1000]) expect(sha256Hex("x".repeat(n))).toBe(nodeSha("x".repeat(n)));
    fc.assert(
      fc.property(fc.string({ unit: "binary", maxLength: 200 }), (s) => sha256Hex(s) === nodeSha(s)),
      { numRuns: 150 },
    );
    expect(sha256Hex("τ (µs) — NV⁻ 🧪")).toBe(nodeSha("τ (µs) — NV⁻ 🧪"));
  });
});

describe("canonical JSON and content hash", () => {
  it("sorts keys at every depth, drops undefined properties and writes undefined array items as null", () => {
    expect(canonicalJson({ b: 1, a: { d: [3, { z: 1, y: undefined }], c: "x" }, e: undefined, arr: [undefined] })).toBe(
      '{"a":{"c":"x","d":[3,{"z":1}]},"arr":[null],"b":1}',
    );
  });

  it("equals sorted-key JSON.stringify for every JSON value (one form for browser and server hashes)", () => {
    fc.assert(
      fc.property(fc.jsonValue(), (v) => canonicalJson(v) === sortedStringify(v)),
      { numRuns: 300 },
    );
  });

  it("keeps a __proto__ key as data (found by the property above)", () => {
    expect(canonicalJson(JSON.parse('{"__proto__":null,"a":1}'))).toBe('{"__proto__":null,"a":1}');
  });

  it("does not depend on key order", () => {
    const a = { mark: "point", data: { name: "echo" }, encoding: { y: { field: "s" }, x: { field: "t" } } };
    const b = { encoding: { x: { field: "t" }, y: { field: "s" } }, data: { name: "echo" }, mark: "point" };
    expect(contentHash(a, { echo: "version:ab" })).toBe(contentHash(b, { echo: "version:ab" }));
  });

  it("is SHA-256 of the canonical { spec, bindings } — the formula lib/server/figures stores", () => {
    const spec = { data: { name: "echo" }, mark: "point" };
    const bindings = { echo: "version:0123abcd", fit: "analysis:feedbeef:curve" };
    // The canonical text written by hand (keys sorted at every depth, no whitespace), hashed by node:crypto;
    // the digest also as a literal (printf '%s' '<text>' | sha256sum).
    const canonical = '{"bindings":{"echo":"version:0123abcd","fit":"analysis:feedbeef:curve"},"spec":{"data":{"name":"echo"},"mark":"point"}}';
    expect(nodeSha(canonical)).toBe("53057a9b52350589e3a75dfe9d8846b27b6ddf378ee85d9dc895462ef6df2c74");
    expect(contentHash(spec, bindings)).toBe("53057a9b52350589e3a75dfe9d8846b27b6ddf378ee85d9dc895462ef6df2c74");
    // …and the server's own helpers store the same hash for the same revision.
    expect(serverSha256(canonicalJson({ spec, bindings }))).toBe("53057a9b52350589e3a75dfe9d8846b27b6ddf378ee85d9dc895462ef6df2c74");
  });

  it("changes when the spec or any bound hash changes", () => {
    const spec = { data: { name: "echo" }, mark: "point" };
    const h = contentHash(spec, { echo: "version:1" });
    expect(contentHash({ ...spec, mark: "line" }, { echo: "version:1" })).not.toBe(h);
    expect(contentHash(spec, { echo: "version:2" })).not.toBe(h);
  });

  it("refuses values that are not JSON instead of hashing them as null", () => {
    expect(() => canonicalJson({ a: NaN })).toThrow(CanonicalJsonError);
    expect(() => canonicalJson({ a: () => 1 })).toThrow(CanonicalJsonError);
    const cyclic: Record<string, unknown> = {};
    cyclic.self = cyclic;
    expect(() => canonicalJson(cyclic)).toThrow(/circular/);
  });
});
