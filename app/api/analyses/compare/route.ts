// Fit two to four candidate models to the same data and rank them; nothing is stored.
import { withPermission } from "@/lib/http/route";
import { compareCandidates } from "@/lib/server/analyses/compare";
import { manuscriptOfVersion } from "@/lib/server/datasets/scope";
import { comparisonInput } from "@/lib/server/analyses/schemas";

export const POST = withPermission(
  "analysis.run",
  { body: comparisonInput, scope: ({ body }) => manuscriptOfVersion(body.versionId) },
  async ({ user, body }) => compareCandidates(user, body),
);
