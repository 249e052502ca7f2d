// A manuscript with its members, figures, panels and derived review states.
import { keptJsonResponse } from "@/lib/http/kept-json-response";
import { withPermission } from "@/lib/http/route";
import { getManuscriptJson } from "@/lib/server/manuscripts";

export const GET = withPermission("manuscript.read", { scope: ({ params }) => params.id }, async ({ req, user, params, role }) =>
  keptJsonResponse(req, await getManuscriptJson(user, params.id, role)),
);
