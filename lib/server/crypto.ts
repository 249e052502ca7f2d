import "server-only";
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

// Canonical JSON (sorted keys, what content hashes are taken of) is @/lib/figures/canonical-spec's
// canonicalJson: one serialisation for the browser and the server.
