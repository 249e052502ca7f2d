// The fit models and calculators with their parameters and units.
import { withPermission } from "@/lib/http/route";
import { analysisCatalogue } from "@/lib/server/analyses/catalogue";

export const GET = withPermission("model.list", {}, () => analysisCatalogue());
