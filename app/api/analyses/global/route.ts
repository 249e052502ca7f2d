// Fit one model over several versions at once with some parameters shared; nothing is stored.
import { withPermission } from "@/lib/http/route";
import { previewGlobalFit } from "@/lib/server/analyses/global";
import { globalInput } from "@/lib/server/analyses/schemas";

export const POST = withPermission("analysis.run", { body: globalInput, scope: ({ body }) => body.manuscriptId }, async ({ user, body }) =>
  previewGlobalFit(user, body),
);
