import { createHash, randomBytes } from "node:crypto";

export function newId(): string {
  return randomBytes(12).toString("base64url");
}

/** A secret handed to a person once; only its SHA-256 is stored. */
export function newSecret(prefix: string): { secret: string; hash: string } {
  const secret = `${prefix}_${randomBytes(32).toString("base64url")}`;
  return { secret, hash: sha256Hex(secret) };
}

export function sha256Hex(input: string | Uint8Array): string {
  return createHash("sha256").update(input).digest("hex");
}

/** JSON with object keys sorted, so equal content always hashes the same. */
export function canonicalJson(value: unknown): string {
  return JSON.stringify(sortKeys(value));
}

function sortKeys(value: unknown): unknown {
  if (Array.isArray(value)) return value.map(sortKeys);
  if (value && typeof value === "object") {
    const out: Record<string, unknown> = {};
    for (const key of Object.keys(value as Record<string, unknown>).sort()) {
      const v = (value as Record<string, unknown>)[key];
      if (v !== undefined) out[key] = sortKeys(v);
    }
    return out;
  }
  return value;
}
