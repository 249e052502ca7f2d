// Record "approved" or "needs_revision" on the current revision's content hash.
import { created, withPermission } from "@/lib/http/route";
import { manuscriptOfPanel } from "@/lib/server/figures/scope";
import { recordDecision } from "@/lib/server/review/decisions";
import { decisionInput } from "@/lib/server/review/schemas";

export const POST = withPermission(
  "review.decide",
  { scope: ({ params }) => manuscriptOfPanel(params.id), body: decisionInput },
  async ({ user, params, body }) => created(await recordDecision(user, params.id, body)),
);
