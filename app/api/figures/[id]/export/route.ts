// Files to submit: ?format=svg|pdf|png (&dpi=300|600|1200)|source-data|bundle, &mark=off to leave out the draft mark.
import { withPermission } from "@/lib/http/route";
import { exportFigure, exportQuery } from "@/lib/server/export/export-figure";
import { manuscriptOfFigure } from "@/lib/server/figures/scope";

export const GET = withPermission(
  "manuscript.export",
  { scope: ({ params }) => manuscriptOfFigure(params.id), query: exportQuery },
  async ({ user, params, query }) => {
    const { body, headers } = await exportFigure(user, params.id, query);
    return new Response(await body.toResponseBody(), { headers });
  },
);
