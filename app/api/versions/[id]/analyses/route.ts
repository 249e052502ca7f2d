// Analysis runs made on a version, newest first (`?archived=1`: the archived ones).
import { archivedQuery } from "@/lib/server/archive/archive";
import { withPermission } from "@/lib/http/route";
import { manuscriptOfVersion } from "@/lib/server/datasets/scope";
import { listAnalysesForVersion } from "@/lib/server/analyses/run-analysis";

export const GET = withPermission(
  "manuscript.read",
  { scope: ({ params }) => manuscriptOfVersion(params.id), query: archivedQuery },
  async ({ user, params, query }) => ({ items: await listAnalysesForVersion(user, params.id, query.archived === "1") }),
);
