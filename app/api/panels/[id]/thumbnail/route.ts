// A panel's current revision as a small PNG (cached by content hash, drawn on first request); a placeholder without a revision.
import { withPermission } from "@/lib/http/route";
import { panelThumbnail, thumbnailQuery, thumbnailResponse } from "@/lib/server/export/thumbnails";
import { manuscriptOfPanel } from "@/lib/server/figures/scope";

export const GET = withPermission(
  "manuscript.read",
  { scope: ({ params }) => manuscriptOfPanel(params.id), query: thumbnailQuery },
  async ({ req, user, params, query }) => thumbnailResponse(req, query, await panelThumbnail(user, params.id)),
);
