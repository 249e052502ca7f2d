// Archive (true) or restore (false) a figure; it stays resolvable from every trace that names it.
import { withPermission } from "@/lib/http/route";
import { archiveInput, manuscriptOfArchivable, setArchived } from "@/lib/server/archive/archive";

export const POST = withPermission(
  "archive.manage",
  { scope: ({ params }) => manuscriptOfArchivable("figure", params.id), body: archiveInput },
  async ({ user, params, body }) => setArchived(user, "figure", params.id, body),
);
