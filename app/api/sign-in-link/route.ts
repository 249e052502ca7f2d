// Ask for an e-mail sign-in link; the answer is the same whether or not the address has an account.
import { z } from "zod";
import { readJsonBody } from "@/lib/http/read-json-body";
import { publicRoute } from "@/lib/http/route";
import { clientAddress } from "@/lib/server/limits/client-address";
import { requestSignInLink } from "@/lib/server/sign-in-links";

const input = z.object({ email: z.string().trim().max(254, "An e-mail address has at most 254 characters.").email("Give a valid e-mail address.") });

export const POST = publicRoute(async (req) => {
  const { email } = input.parse(await readJsonBody(req));
  await requestSignInLink(email, clientAddress(req.headers));
  return Response.json({ ok: true, message: "If the address has an account, a sign-in link is on its way." }, { status: 202 });
});
