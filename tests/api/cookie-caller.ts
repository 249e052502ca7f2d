import { vi } from "vitest";

/**
 * A session cookie cannot be minted outside a Next request scope, so tests that need one mock
 * `@/lib/http/request-user` with this: a request carrying a session cookie is the demo author; a
 * bearer token still wins over the cookie, as in the real resolver. Use:
 * `vi.mock("@/lib/http/request-user", () => import("./cookie-caller").then((m) => m.cookieCallerModule()));`
 */
export async function cookieCallerModule() {
  const actual = await vi.importActual<typeof import("@/lib/http/request-user")>("@/lib/http/request-user");
  const { getUserById } = await import("@/lib/server/users");
  return {
    ...actual,
    resolveCaller: async (req: Request) => {
      if (req.headers.get("authorization") || !req.headers.get("cookie")?.includes("authjs.session-token=")) return actual.resolveCaller(req);
      const user = await getUserById("demo-author");
      return user ? { user, via: "session" as const } : null;
    },
  };
}
