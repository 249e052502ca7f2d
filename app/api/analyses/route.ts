// Run a fit on a version and store it with a derived version (curve, data, residuals).
import { created, withPermission } from "@/lib/http/route";
import { manuscriptOfVersion } from "@/lib/server/datasets/scope";
import { runAnalysis } from "@/lib/server/analyses/run-analysis";
import { analysisInput } from "@/lib/server/analyses/schemas";

export const POST = withPermission("analysis.run", { body: analysisInput, scope: ({ body }) => manuscriptOfVersion(body.versionId) }, async ({ user, body }) =>
  created(await runAnalysis(user, body)),
);
