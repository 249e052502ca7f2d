// Analysis runs made on a version, newest first.
import { withPermission } from "@/lib/http/route";
import { manuscriptOfVersion } from "@/lib/server/datasets/scope";
import { listAnalysesForVersion } from "@/lib/server/analyses/run-analysis";

export const GET = withPermission("manuscript.read", { scope: ({ params }) => manuscriptOfVersion(params.id) }, async ({ user, params }) => ({
  items: await listAnalysesForVersion(user, params.id),
}));
