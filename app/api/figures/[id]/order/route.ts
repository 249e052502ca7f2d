// Reorder a figure's panels; letters follow the new order.
import { withPermission } from "@/lib/http/route";
import { reorderPanels } from "@/lib/server/figures/figures";
import { reorderInput } from "@/lib/server/figures/schemas";
import { manuscriptOfFigure } from "@/lib/server/figures/scope";

export const POST = withPermission(
  "figure.edit",
  { scope: ({ params }) => manuscriptOfFigure(params.id), body: reorderInput },
  async ({ user, params, body }) => reorderPanels(user, params.id, body),
);
