// A panel with its current revision, derived review state and decisions.
import { withPermission } from "@/lib/http/route";
import { getPanel } from "@/lib/server/figures/panels";
import { manuscriptOfPanel } from "@/lib/server/figures/scope";

export const GET = withPermission("manuscript.read", { scope: ({ params }) => manuscriptOfPanel(params.id) }, async ({ user, params }) =>
  getPanel(user, params.id),
);
