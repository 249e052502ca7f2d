// Two columns of a version for a quick look, downsampled for display with extremes kept.
import { withPermission } from "@/lib/http/route";
import { getVersionPlot } from "@/lib/server/datasets/read-datasets";
import { plotQuery } from "@/lib/server/datasets/schemas";
import { manuscriptOfVersion } from "@/lib/server/datasets/scope";

export const GET = withPermission(
  "manuscript.read",
  { scope: ({ params }) => manuscriptOfVersion(params.id), query: plotQuery },
  async ({ user, params, query }) => getVersionPlot(user, params.id, query.x, query.y, query.points),
);
