import "server-only";
import { createHash, randomBytes } from "node:crypto";

const ID_BYTES = 12;
/** Random bytes drawn for 256 ids at once: each draw is a call into OpenSSL that costs more than the id. */
let idPool = Buffer.alloc(0);
let idOffset = 0;

/** 96 random bits as 16 base64url characters. */
export function newId(): string {
  if (idOffset + ID_BYTES > idPool.length) {
    idPool = randomBytes(ID_BYTES * 256);
    idOffset = 0;
  }
  const id = idPool.toString("base64url", idOffset, idOffset + ID_BYTES);
  idOffset += ID_BYTES;
  return id;
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
