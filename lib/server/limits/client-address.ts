import "server-only";
import { isIP } from "node:net";
import { env } from "@/lib/env";

/**
 * The header our own server sets on every request from the TCP peer's address (see
 * instrumentation.ts); a value a client sends under this name is overwritten, never trusted.
 */
export const PEER_HEADER = "x-prooflight-peer";

const V4_MAPPED = /^::ffff:(\d+\.\d+\.\d+\.\d+)$/i;
const normalise = (a: string) =>
  a
    .trim()
    .replace(V4_MAPPED, "$1")
    .replace(/^\[|\]$/g, "");

export function isLoopback(address: string | null | undefined): boolean {
  if (!address) return false;
  const a = normalise(address);
  return a === "::1" || /^127\.\d+\.\d+\.\d+$/.test(a);
}

/**
 * The client's address for rate limits. The TCP peer is the client unless it is one of the
 * proxies named in TRUSTED_PROXIES; only then is X-Forwarded-For read, right to left, skipping
 * trusted hops. Without the peer header (a request built in a test or a script) the answer is
 * "unknown", one shared bucket, never a value the client chose.
 */
export function clientAddress(headers: Headers): string {
  const peer = headers.get(PEER_HEADER);
  if (!peer || !isIP(normalise(peer))) return "unknown";
  const trusted = env().trustedProxies;
  let address = normalise(peer);
  if (!trusted.includes(address)) return address;
  const hops = (headers.get("x-forwarded-for") ?? "").split(",").map(normalise).filter(Boolean);
  while (hops.length) {
    const hop = hops.pop()!;
    if (!isIP(hop)) return address;
    address = hop;
    if (!trusted.includes(hop)) return hop;
  }
  return address;
}
