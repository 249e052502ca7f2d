// The original bytes of a version, byte for byte.
import { withPermission } from "@/lib/http/route";
import { openRawVersion } from "@/lib/server/datasets/read-datasets";
import { manuscriptOfVersion } from "@/lib/server/datasets/scope";

export const GET = withPermission("manuscript.export", { scope: ({ params }) => manuscriptOfVersion(params.id) }, async ({ user, params }) => {
  const { body, headers } = await openRawVersion(user, params.id);
  return new Response(body, { headers });
});
