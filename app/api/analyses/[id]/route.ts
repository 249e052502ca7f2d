// A stored analysis run: input hash, model and code version, options, full result, derived version.
import { withPermission } from "@/lib/http/route";
import { getAnalysis, manuscriptOfAnalysis } from "@/lib/server/analyses/run-analysis";

export const GET = withPermission("manuscript.read", { scope: ({ params }) => manuscriptOfAnalysis(params.id) }, async ({ user, params }) =>
  getAnalysis(user, params.id),
);
