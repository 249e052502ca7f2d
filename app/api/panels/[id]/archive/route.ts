// Archive (true) or restore (false) a panel; it stays resolvable from every trace that names it.
import { withPermission } from "@/lib/http/route";
import { archiveInput, manuscriptOfArchivable, setArchived } from "@/lib/server/archive/archive";

export const POST = withPermission(
  "archive.manage",
  { scope: ({ params }) => manuscriptOfArchivable("panel", params.id), body: archiveInput },
  async ({ user, params, body }) => setArchived(user, "panel", params.id, body),
);
