// Parsed rows of a version, paged from the columnar cache (?offset&limit).
import { withPermission } from "@/lib/http/route";
import { getVersionRows } from "@/lib/server/datasets/read-datasets";
import { rowsQuery } from "@/lib/server/datasets/schemas";
import { manuscriptOfVersion } from "@/lib/server/datasets/scope";

export const GET = withPermission(
  "manuscript.read",
  { scope: ({ params }) => manuscriptOfVersion(params.id), query: rowsQuery },
  async ({ user, params, query }) => getVersionRows(user, params.id, query.offset, query.limit),
);
