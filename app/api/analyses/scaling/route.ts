// Decoupling scaling T₂(N) = T₂(1)·N^s over stored runs, one point per run; nothing is stored.
import { withPermission } from "@/lib/http/route";
import { fitScaling, scalingInput } from "@/lib/server/analyses/scaling";

export const POST = withPermission("analysis.run", { body: scalingInput, scope: ({ body }) => body.manuscriptId }, async ({ user, body }) =>
  fitScaling(user, body),
);
