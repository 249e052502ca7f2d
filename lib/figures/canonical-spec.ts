/**
 * Canonical JSON and the panel-revision content hash (DESIGN.md §3).
 *
 * Canonical form: object keys sorted by UTF-16 code units, properties whose value is `undefined`
 * dropped, `undefined` inside arrays written as `null`, no whitespace, numbers and strings as
 * `JSON.stringify` writes them. For JSON data this is the RFC 8785 (JCS) serialisation. The
 * server uses this same function (lib/server/audit, lib/server/figures), so hashes computed here
 * (also in the browser) match the ones the server stores.
 *
 * SHA-256 is the small synchronous implementation in ./sha256 (Web Crypto is async only).
 */
import { sha256Hex } from "./sha256";

export class CanonicalJsonError extends Error {
  constructor(message: string) {
    super(message);
    this.name = "CanonicalJsonError";
  }
}

/** JSON with sorted keys and no undefined; throws CanonicalJsonError on non-finite numbers, cycles, functions, bigint. */
export function canonicalJson(value: unknown): string {
  return JSON.stringify(sortKeys(value, new Set(), "value"));
}

function sortKeys(value: unknown, seen: Set<object>, path: string): unknown {
  if (typeof value === "number" && !Number.isFinite(value)) throw new CanonicalJsonError(`${path}: ${value} is not a JSON number`);
  if (typeof value === "function" || typeof value === "symbol" || typeof value === "bigint") {
    throw new CanonicalJsonError(`${path}: a ${typeof value} is not JSON`);
  }
  if (value === null || typeof value !== "object") return value;
  if (seen.has(value)) throw new CanonicalJsonError(`${path}: circular reference`);
  seen.add(value);
  let out: unknown;
  if (Array.isArray(value)) {
    out = value.map((v, i) => (v === undefined ? null : sortKeys(v, seen, `${path}[${i}]`)));
  } else {
    const src = value as Record<string, unknown>;
    // No prototype: a "__proto__" key is kept as data, not turned into a prototype and lost from the hash.
    const sorted = Object.create(null) as Record<string, unknown>;
    for (const key of Object.keys(src).sort()) {
      const v = src[key];
      if (v !== undefined) sorted[key] = sortKeys(v, seen, `${path}.${key}`);
    }
    out = sorted;
  }
  seen.delete(value);
  return out;
}

/**
 * Content hash of a panel revision: SHA-256 hex of the canonical JSON of
 * `{ spec, bindings: { <data name>: <hash string of what it is bound to> } }`.
 * The hash strings are whatever the binding layer records (lib/server/figures uses
 * `version:<sha256>` or `analysis:<sha256>:<output>`); this function only combines them.
 */
export function contentHash(spec: unknown, boundHashes: Record<string, string>): string {
  return sha256Hex(canonicalJson({ spec, bindings: boundHashes }));
}
