// The caller's personal API tokens: list / create (the secret is shown once).
import { created, withPermission } from "@/lib/http/route";
import { createApiToken, createTokenInput, listApiTokens } from "@/lib/server/api-tokens";

export const GET = withPermission("self.tokens", {}, async ({ user }) => ({ items: await listApiTokens(user) }));

export const POST = withPermission("self.tokens", { body: createTokenInput }, async ({ user, body }) => created(await createApiToken(user, body)));
