// Add a panel to a figure; it gets the next letter.
import { created, withPermission } from "@/lib/http/route";
import { addPanel } from "@/lib/server/figures/panels";
import { addPanelInput } from "@/lib/server/figures/schemas";
import { manuscriptOfFigure } from "@/lib/server/figures/scope";

export const POST = withPermission(
  "figure.edit",
  { scope: ({ params }) => manuscriptOfFigure(params.id), body: addPanelInput },
  async ({ user, params, body }) => created(await addPanel(user, params.id, body)),
);
