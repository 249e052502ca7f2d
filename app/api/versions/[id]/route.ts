// A version's metadata: hash, size, rows, columns with units, parse warnings, column summary.
import { withPermission } from "@/lib/http/route";
import { getVersion } from "@/lib/server/datasets/read-datasets";
import { manuscriptOfVersion } from "@/lib/server/datasets/scope";

export const GET = withPermission("manuscript.read", { scope: ({ params }) => manuscriptOfVersion(params.id) }, async ({ user, params }) =>
  getVersion(user, params.id),
);
