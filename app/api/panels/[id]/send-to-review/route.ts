// The author sends a draft panel to review: reviewers are asked from now on.
import { withPermission } from "@/lib/http/route";
import { manuscriptOfPanel } from "@/lib/server/figures/scope";
import { sendToReview } from "@/lib/server/review/review-edges";

export const POST = withPermission("figure.edit", { scope: ({ params }) => manuscriptOfPanel(params.id) }, async ({ user, params }) =>
  sendToReview(user, params.id),
);
