// Auth.js endpoints; password sign-ins are refused with 429 here before Auth.js sees them when rate-limited.
// POST bodies (sign-in forms, CSRF token) are small: over 64 kB is refused with 413 before Auth.js reads a byte.
import { NextRequest } from "next/server";
import { handlers } from "@/auth";
import { errorResponse } from "@/lib/http/errors";
import { withBufferedBody } from "@/lib/http/read-json-body";
import { publicRoute } from "@/lib/http/route";
import { signInBlockFor } from "@/lib/server/sign-in-limits";

export const GET = publicRoute(async (req) => handlers.GET(req as never));

const AUTH_BODY_MAX_BYTES = 64 * 1024;

export const POST = publicRoute(async (incoming) => {
  // A NextRequest again: with AUTH_URL set, Auth.js reads `req.nextUrl`.
  const req = new NextRequest(await withBufferedBody(incoming, AUTH_BODY_MAX_BYTES));
  if (new URL(req.url).pathname.endsWith("/callback/password")) {
    const form = await req
      .clone()
      .formData()
      .catch(() => null);
    const email = form?.get("email");
    const block = await signInBlockFor(typeof email === "string" ? email : "", req.headers);
    if (block) return errorResponse(429, "too_many_requests", block.message, undefined, block.retryAfterSeconds);
  }
  return handlers.POST(req);
});
