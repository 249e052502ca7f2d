// The PI withdraws a sign-off with a reason; it stays on record and no longer counts.
import { withPermission } from "@/lib/http/route";
import { manuscriptOfFigure } from "@/lib/server/figures/scope";
import { withdrawSignoff, withdrawSignoffInput } from "@/lib/server/review/review-edges";

export const POST = withPermission(
  "figure.signoff",
  { scope: ({ params }) => manuscriptOfFigure(params.id), body: withdrawSignoffInput },
  async ({ user, params, body }) => withdrawSignoff(user, params.id, body),
);
