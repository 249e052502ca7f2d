// Population statistics of a fitted parameter, grouped by a tag or metadata field, with group comparisons.
import { withPermission } from "@/lib/http/route";
import { populationStatistics } from "@/lib/server/analyses/population";
import { statisticsQuery } from "@/lib/server/analyses/schemas";

export const GET = withPermission("manuscript.read", { scope: ({ params }) => params.id, query: statisticsQuery }, async ({ user, params, query }) =>
  populationStatistics(user, params.id, query.model, query.parameter, query.groupBy),
);
