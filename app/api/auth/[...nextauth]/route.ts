// Auth.js endpoints; password sign-ins are refused with 429 here before Auth.js sees them when rate-limited.
import { handlers } from "@/auth";
import { errorResponse } from "@/lib/http/errors";
import { publicRoute } from "@/lib/http/route";
import { clientIp, signInBlockedReason } from "@/lib/server/sign-in-limits";

export const GET = publicRoute(async (req) => handlers.GET(req as never));

export const POST = publicRoute(async (req) => {
  if (new URL(req.url).pathname.endsWith("/callback/password")) {
    const form = await req.clone().formData().catch(() => null);
    const reason = await signInBlockedReason(String(form?.get("email") ?? ""), clientIp(req.headers));
    if (reason) return errorResponse(429, "too_many_requests", reason);
  }
  return handlers.POST(req as never);
});
