// A figure with its lettered panels / change its title, size, columns or required reviewers.
import { withPermission } from "@/lib/http/route";
import { deleteForGood, manuscriptOfArchivable } from "@/lib/server/archive/archive";
import { getFigure, updateFigure } from "@/lib/server/figures/figures";
import { updateFigureInput } from "@/lib/server/figures/schemas";
import { manuscriptOfFigure } from "@/lib/server/figures/scope";

export const GET = withPermission("manuscript.read", { scope: ({ params }) => manuscriptOfFigure(params.id) }, async ({ user, params }) =>
  getFigure(user, params.id),
);

export const PATCH = withPermission(
  "figure.edit",
  { scope: ({ params }) => manuscriptOfFigure(params.id), body: updateFigureInput },
  async ({ user, params, body }) => updateFigure(user, params.id, body),
);

/** The PI deletes an archived figure nothing references, for good (409 names what still does). */
export const DELETE = withPermission("archive.delete", { scope: ({ params }) => manuscriptOfArchivable("figure", params.id) }, async ({ user, params }) =>
  deleteForGood(user, "figure", params.id),
);
