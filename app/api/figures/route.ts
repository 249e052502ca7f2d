// Create a figure in a manuscript (numbered in order; width 89, 120, 183 mm or custom).
import { created, withPermission } from "@/lib/http/route";
import { createFigure } from "@/lib/server/figures/figures";
import { createFigureInput } from "@/lib/server/figures/schemas";

export const POST = withPermission("figure.edit", { body: createFigureInput, scope: ({ body }) => body.manuscriptId }, async ({ user, body }) =>
  created(await createFigure(user, body)),
);
