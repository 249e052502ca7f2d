// The figure as a small PNG (cached by figure hash, drawn on first request); a placeholder when it has no panels.
import { withPermission } from "@/lib/http/route";
import { figureThumbnail, thumbnailQuery, thumbnailResponse } from "@/lib/server/export/thumbnails";
import { manuscriptOfFigure } from "@/lib/server/figures/scope";

export const GET = withPermission(
  "manuscript.read",
  { scope: ({ params }) => manuscriptOfFigure(params.id), query: thumbnailQuery },
  async ({ req, user, params, query }) => thumbnailResponse(req, query, await figureThumbnail(user, params.id)),
);
