// Run a physics calculator (an estimate, not a calibration).
import { withPermission } from "@/lib/http/route";
import { calculate } from "@/lib/server/analyses/catalogue";
import { calculatorInput } from "@/lib/server/analyses/schemas";

export const POST = withPermission("model.list", { body: calculatorInput }, ({ params, body }) => calculate(params.id, body.inputs));
