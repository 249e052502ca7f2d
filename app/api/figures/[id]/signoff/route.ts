// PI sign-off of the figure's current hash (a reason is required while issues are open).
import { created, withPermission } from "@/lib/http/route";
import { manuscriptOfFigure } from "@/lib/server/figures/scope";
import { signOffFigure } from "@/lib/server/review/decisions";
import { signoffInput } from "@/lib/server/review/schemas";

export const POST = withPermission(
  "figure.signoff",
  { scope: ({ params }) => manuscriptOfFigure(params.id), body: signoffInput },
  async ({ user, params, body }) => created(await signOffFigure(user, params.id, body)),
);
