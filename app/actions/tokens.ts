"use server";
import { revalidatePath } from "next/cache";
import { z } from "zod";
import { withAction } from "@/lib/http/action";
import { createApiToken, createTokenInput, revokeApiToken } from "@/lib/server/api-tokens";

export const createTokenAction = withAction("self.tokens", { input: createTokenInput }, async ({ user, input }) => {
  const t = await createApiToken(user, input);
  revalidatePath("/settings/tokens");
  return { ok: true, message: "Copy the token now: it is shown only once.", data: { token: t.token } };
});

export const revokeTokenAction = withAction("self.tokens", { input: z.object({ tokenId: z.string().min(1) }) }, async ({ user, input }) => {
  await revokeApiToken(user, input.tokenId);
  revalidatePath("/settings/tokens");
  return { ok: true, message: "Token revoked." };
});
