// One-click unsubscribe (RFC 8058): the List-Unsubscribe address of every notice mail. Signed out by
// design: the signed, expiring token in the address names the person and the kinds it turns off.
import { env } from "@/lib/env";
import { badRequest } from "@/lib/errors";
import { publicRoute } from "@/lib/http/route";
import { applyUnsubscribe } from "@/lib/server/mail/unsubscribe";

function tokenOf(req: Request): string {
  const token = new URL(req.url).searchParams.get("token");
  if (!token) throw badRequest("token: the unsubscribe link has no token; use the link from the mail as it is.");
  if (token.length > 2000) throw badRequest("token: longer than any unsubscribe link; use the link from the mail as it is.");
  return token;
}

const landing = (token: string, done = false) =>
  new Response(null, { status: 303, headers: { location: `${env().appUrl}/unsubscribe?token=${encodeURIComponent(token)}${done ? "&done=1" : ""}` } });

/** A mail client or a person that opens the address gets the landing page, which asks before turning anything off. */
export const GET = publicRoute((req) => landing(tokenOf(req)));

/** Turns the token's kinds off. The landing page's button (`via=page`) goes back to the page; mail clients get JSON. */
export const POST = publicRoute(async (req) => {
  const token = tokenOf(req);
  const done = await applyUnsubscribe(token);
  if (new URL(req.url).searchParams.get("via") === "page") return landing(token, true);
  return Response.json({
    ok: true,
    email: done.email,
    turnedOff: done.kinds.map((k) => k.kind),
    message: `Turned off for ${done.email}: ${done.kinds.map((k) => k.label).join(", ")}.`,
  });
});
