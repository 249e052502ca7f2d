import Negotiator from "negotiator";
import type { KeptJson } from "@/lib/server/kept-json";

/** Below this, the server does not compress (its own threshold is the same 1 KB). */
const COMPRESS_FROM_BYTES = 1024;

/**
 * A kept answer, compressed already when the client accepts gzip: the server compresses every
 * answer anew otherwise, and leaves one that carries a Content-Encoding as it is.
 */
export function keptJsonResponse(req: Request, kept: KeptJson): Response {
  const headers: Record<string, string> = { "content-type": "application/json", vary: "Accept-Encoding" };
  const acceptEncoding = req.headers.get("accept-encoding");
  const gzip =
    kept.text.length >= COMPRESS_FROM_BYTES &&
    acceptEncoding !== null &&
    new Negotiator({ headers: { "accept-encoding": acceptEncoding } }).encoding(["gzip", "identity"]) === "gzip";
  if (!gzip) return new Response(kept.text, { headers });
  return new Response(kept.gzip, { headers: { ...headers, "content-encoding": "gzip" } });
}
