// One immutable revision: canonical spec, bindings, what they resolved to, content hash.
import { withPermission } from "@/lib/http/route";
import { getRevision } from "@/lib/server/figures/revisions";
import { manuscriptOfRevision } from "@/lib/server/figures/scope";

export const GET = withPermission("manuscript.read", { scope: ({ params }) => manuscriptOfRevision(params.id) }, async ({ user, params }) =>
  getRevision(user, params.id),
);
