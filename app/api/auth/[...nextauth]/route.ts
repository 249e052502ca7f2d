// Auth.js endpoints; password sign-ins are refused with 429 here before Auth.js sees them when rate-limited.
import { handlers } from "@/auth";
import { errorResponse } from "@/lib/http/errors";
import { publicRoute } from "@/lib/http/route";
import { clientAddress } from "@/lib/server/limits/client-address";
import { signInBlock } from "@/lib/server/sign-in-limits";

export const GET = publicRoute(async (req) => handlers.GET(req as never));

export const POST = publicRoute(async (req) => {
  if (new URL(req.url).pathname.endsWith("/callback/password")) {
    const form = await req.clone().formData().catch(() => null);
    const block = await signInBlock(String(form?.get("email") ?? ""), clientAddress(req.headers));
    if (block) return errorResponse(429, "too_many_requests", block.message, undefined, block.retryAfterSeconds);
  }
  return handlers.POST(req as never);
});
