// The manuscript's figures with their panels, in order.
import { withPermission } from "@/lib/http/route";
import { listFiguresForManuscript } from "@/lib/server/figures/figures";

export const GET = withPermission("manuscript.read", { scope: ({ params }) => params.id }, async ({ user, params }) => ({
  items: await listFiguresForManuscript(user, params.id),
}));
