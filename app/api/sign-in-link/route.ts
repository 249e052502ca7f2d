// Ask for an e-mail sign-in link; the answer is the same whether or not the address has an account.
import { z } from "zod";
import { readJsonBody } from "@/lib/http/read-json-body";
import { publicRoute } from "@/lib/http/route";
import { clientAddress } from "@/lib/server/limits/client-address";
import { requestSignInLink } from "@/lib/server/sign-in-links";
import { emailInput } from "@/lib/server/users";

const input = z.object({ email: emailInput });

export const POST = publicRoute(async (req) => {
  const { email } = input.parse(await readJsonBody(req));
  await requestSignInLink(email, clientAddress(req.headers));
  return Response.json({ ok: true, message: "If the address has an account, a sign-in link is on its way." }, { status: 202 });
});
