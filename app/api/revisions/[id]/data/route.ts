// The rows a revision's data names resolve to, reduced for display (extremes kept); exports use full data.
// `warnings`: fields the data lacks, data with no rows, rows left out (lib/server/figures/integrity).
import { withPermission } from "@/lib/http/route";
import { displayDataFor } from "@/lib/server/figures/display-data";
import { revisionWarnings } from "@/lib/server/figures/integrity";
import { getRevision } from "@/lib/server/figures/revisions";
import { manuscriptOfRevision } from "@/lib/server/figures/scope";

export const GET = withPermission("manuscript.read", { scope: ({ params }) => manuscriptOfRevision(params.id) }, async ({ user, params }) => {
  const rev = await getRevision(user, params.id);
  return { revisionId: rev.id, data: await displayDataFor(rev.bound), warnings: await revisionWarnings(rev) };
});
