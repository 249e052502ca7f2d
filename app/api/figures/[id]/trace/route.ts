// The provenance chain of a figure: raw file → analysis → revision → figure, with every hash.
import { withPermission } from "@/lib/http/route";
import { manuscriptOfFigure } from "@/lib/server/figures/scope";
import { traceFigure } from "@/lib/server/figures/trace";

export const GET = withPermission("manuscript.read", { scope: ({ params }) => manuscriptOfFigure(params.id) }, async ({ user, params }) =>
  traceFigure(user, params.id),
);
