// A manuscript with its members, figures, panels and derived review states.
import { withPermission } from "@/lib/http/route";
import { getManuscript } from "@/lib/server/manuscripts";

export const GET = withPermission("manuscript.read", { scope: ({ params }) => params.id }, async ({ user, params, role }) =>
  getManuscript(user, params.id, role),
);
