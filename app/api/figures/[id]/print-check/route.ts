// The figure's print check: text sizes at its width, its size, axis units, colour pairs under colour-vision
// deficiencies, error bars, n, raster resolution and data versions, each with the reason for a failure.
import { withPermission } from "@/lib/http/route";
import { figurePrintCheck } from "@/lib/server/figures/print-check";
import { manuscriptOfFigure } from "@/lib/server/figures/scope";

export const GET = withPermission("manuscript.read", { scope: ({ params }) => manuscriptOfFigure(params.id) }, async ({ user, params }) =>
  figurePrintCheck(user, params.id),
);
