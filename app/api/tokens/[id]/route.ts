// Revoke one of the caller's API tokens.
import { withPermission } from "@/lib/http/route";
import { revokeApiToken } from "@/lib/server/api-tokens";

export const DELETE = withPermission("self.tokens", {}, async ({ user, params }) => {
  await revokeApiToken(user, params.id);
  return { ok: true };
});
