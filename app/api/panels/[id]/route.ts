// A panel with its current revision, derived review state and decisions.
import { withPermission } from "@/lib/http/route";
import { deleteForGood, manuscriptOfArchivable } from "@/lib/server/archive/archive";
import { getPanel } from "@/lib/server/figures/panels";
import { manuscriptOfPanel } from "@/lib/server/figures/scope";

export const GET = withPermission("manuscript.read", { scope: ({ params }) => manuscriptOfPanel(params.id) }, async ({ user, params }) =>
  getPanel(user, params.id),
);

/** The PI deletes an archived panel nothing references, for good (409 names what still does). */
export const DELETE = withPermission("archive.delete", { scope: ({ params }) => manuscriptOfArchivable("panel", params.id) }, async ({ user, params }) =>
  deleteForGood(user, "panel", params.id),
);
