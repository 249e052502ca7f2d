// A stored analysis run: input hash, model and code version, options, full result, derived version.
import { withPermission } from "@/lib/http/route";
import { deleteForGood, manuscriptOfArchivable } from "@/lib/server/archive/archive";
import { getAnalysis, manuscriptOfAnalysis } from "@/lib/server/analyses/run-analysis";

export const GET = withPermission("manuscript.read", { scope: ({ params }) => manuscriptOfAnalysis(params.id) }, async ({ user, params }) =>
  getAnalysis(user, params.id),
);

/** The PI deletes an archived analysis nothing references, for good (409 names what still does). */
export const DELETE = withPermission("archive.delete", { scope: ({ params }) => manuscriptOfArchivable("analysis", params.id) }, async ({ user, params }) =>
  deleteForGood(user, "analysis", params.id),
);
