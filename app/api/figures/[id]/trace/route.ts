// The provenance chain of a figure: raw file → analysis → revision → figure, with every hash, the review
// decisions, sign-offs and exports; ?format=prov gives it as W3C PROV-JSON.
import { withPermission } from "@/lib/http/route";
import { traceToProv } from "@/lib/server/export/prov";
import { manuscriptOfFigure } from "@/lib/server/figures/scope";
import { traceFigure, traceQuery } from "@/lib/server/figures/trace";

export const GET = withPermission(
  "manuscript.read",
  { scope: ({ params }) => manuscriptOfFigure(params.id), query: traceQuery },
  async ({ user, params, query }) => {
    const trace = await traceFigure(user, params.id);
    return query.format === "prov" ? traceToProv(trace) : trace;
  },
);
