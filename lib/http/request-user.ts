import { auth } from "@/auth";
import type { SessionUser } from "@/lib/authz";
import { userForApiToken } from "@/lib/server/api-tokens";
import { unauthorized } from "@/lib/errors";
import { getUserById } from "@/lib/server/users";

export interface Caller {
  user: SessionUser;
  via: "token" | "session";
}

/** A bearer token wins over the cookie; a bad token is 401 even when a cookie is present. */
export async function resolveCaller(req: Request): Promise<Caller | null> {
  const header = req.headers.get("authorization");
  if (header) {
    const m = /^Bearer\s+(\S+)$/i.exec(header);
    if (!m) throw unauthorized("The Authorization header must be `Bearer <token>`.");
    const user = await userForApiToken(m[1]);
    if (!user) throw unauthorized("This API token is unknown or revoked.");
    return { user, via: "token" };
  }
  // Without a session cookie there is nothing for Auth.js to read; skip it.
  if (!/(?:^|;\s*)(?:__Secure-)?authjs\.session-token(?:\.\d+)?=/.test(req.headers.get("cookie") ?? "")) return null;
  const session = await auth();
  const uid = session?.user?.id;
  if (!uid) return null;
  const user = await getUserById(uid);
  return user ? { user, via: "session" } : null;
}
