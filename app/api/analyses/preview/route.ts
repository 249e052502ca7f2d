// Run a fit without storing it, to adjust start values, bounds and fixed parameters first.
import { withPermission } from "@/lib/http/route";
import { manuscriptOfVersion } from "@/lib/server/datasets/scope";
import { previewAnalysis } from "@/lib/server/analyses/run-analysis";
import { analysisInput } from "@/lib/server/analyses/schemas";

export const POST = withPermission("analysis.run", { body: analysisInput, scope: ({ body }) => manuscriptOfVersion(body.versionId) }, async ({ user, body }) =>
  previewAnalysis(user, body),
);
