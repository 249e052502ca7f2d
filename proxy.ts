// Pages only: a fresh CSP nonce per request, passed to Next (which puts it on its own scripts) and to the browser.
import { NextResponse, type NextRequest } from "next/server";
import { env } from "@/lib/env";
import { pageContentSecurityPolicy } from "@/lib/http/csp";

export function proxy(request: NextRequest) {
  const nonce = Buffer.from(crypto.getRandomValues(new Uint8Array(16))).toString("base64");
  const csp = pageContentSecurityPolicy(nonce, { development: env().nodeEnv === "development", https: env().secureCookies });
  const headers = new Headers(request.headers);
  headers.set("x-nonce", nonce);
  headers.set("content-security-policy", csp);
  const response = NextResponse.next({ request: { headers } });
  response.headers.set("content-security-policy", csp);
  return response;
}

export const config = {
  // API routes (uploads stream through them) and static files stay out of the proxy; next.config.ts gives them their headers.
  matcher: [{ source: "/((?!api/|_next/static|_next/image|favicon.ico|icon.svg|apple-icon.png).*)" }],
};
