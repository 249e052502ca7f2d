import "server-only";
import { listModels } from "@/lib/analysis";
import { listCalculators, runCalculator, CalculatorInputError, UnknownCalculatorError, ESTIMATE_CAUTION } from "@/lib/physics/calculators";
import { badRequest, notFound } from "@/lib/errors";

/** The fit models (parameter units relative to the x/y columns) and the calculators (practical SI units). */
export function analysisCatalogue() {
  return {
    items: listModels().map((m) => ({
      id: m.id,
      type: "model" as const,
      title: m.title,
      formula: m.formula,
      version: m.version,
      kinds: m.kinds,
      parameters: m.params.map((p) => ({ name: p.name, unit: p.unit, description: p.description })),
    })),
    calculators: listCalculators().map((c) => ({
      id: c.id,
      type: "calculator" as const,
      title: c.title,
      formula: c.formula,
      assumptions: c.assumptions,
      source: c.source,
      inputs: c.inputs,
      outputs: c.outputs,
    })),
    unitRoles: "A parameter's unit is given relative to the fitted columns: x, y, 1/x, 1 (dimensionless), x*y, y/x …",
    caution: ESTIMATE_CAUTION,
  };
}

export function calculate(id: string, inputs: Record<string, unknown>) {
  try {
    return { id, ...runCalculator(id, inputs), caution: ESTIMATE_CAUTION };
  } catch (err) {
    if (err instanceof UnknownCalculatorError) throw notFound(`No calculator "${id}".`);
    if (err instanceof CalculatorInputError) throw badRequest(`inputs.${err.message}`);
    throw err;
  }
}
