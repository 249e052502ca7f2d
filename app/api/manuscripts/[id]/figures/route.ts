// The manuscript's figures with their panels, in order (`?archived=1`: the archived ones).
import { archivedQuery } from "@/lib/server/archive/archive";
import { withPermission } from "@/lib/http/route";
import { listFiguresForManuscript } from "@/lib/server/figures/figures";

export const GET = withPermission("manuscript.read", { scope: ({ params }) => params.id, query: archivedQuery }, async ({ user, params, query }) => ({
  items: await listFiguresForManuscript(user, params.id, undefined, query.archived === "1"),
}));
