/**
 * Registry of the physics calculators. Each takes and returns plain numbers in the practical units
 * its descriptor names (MHz, mT, nm, nT, µs …); runCalculator validates the inputs first.
 */
import { type Calculator, type CalculatorInput, CalculatorInputError, UnknownCalculatorError } from "./calculator-types";
import { chargeStateRatioCalculator } from "./charge-state";
import { protonDipoleCalculator } from "./dipole";
import { decouplingDipCalculator, larmorFieldCalculator, larmorFrequencyCalculator, nucleusMatchCalculator } from "./larmor";
import { nmrDepthCalculator, nmrRmsFieldCalculator } from "./nv-nmr";
import { odmrFieldFromPairCalculator, odmrFieldFromSingleLineCalculator, odmrResonancesCalculator } from "./odmr";
import { photonEnergyCalculator, photonWavelengthCalculator } from "./photon";
import { cwOdmrSensitivityCalculator, hahnEchoSensitivityCalculator } from "./sensitivity";
import { arealDensityCalculator } from "./spot-density";

export type { Calculator } from "./calculator-types";
export { CalculatorInputError, UnknownCalculatorError, ESTIMATE_CAUTION } from "./calculator-types";

const CALCULATORS: readonly Calculator[] = [
  odmrFieldFromPairCalculator,
  odmrFieldFromSingleLineCalculator,
  odmrResonancesCalculator,
  larmorFrequencyCalculator,
  larmorFieldCalculator,
  nucleusMatchCalculator,
  decouplingDipCalculator,
  protonDipoleCalculator,
  nmrRmsFieldCalculator,
  nmrDepthCalculator,
  hahnEchoSensitivityCalculator,
  cwOdmrSensitivityCalculator,
  photonEnergyCalculator,
  photonWavelengthCalculator,
  arealDensityCalculator,
  chargeStateRatioCalculator,
];

const BY_ID = new Map(CALCULATORS.map((c) => [c.id, c]));

/** All calculators, in display order. */
export function listCalculators(): Calculator[] {
  return [...CALCULATORS];
}

/** The calculator with this id, or UnknownCalculatorError. */
function getCalculatorOrThrow(id: string): Calculator {
  const calc = BY_ID.get(id);
  if (!calc) throw new UnknownCalculatorError(id);
  return calc;
}

function validateOne(spec: CalculatorInput, raw: unknown): number {
  if (raw === undefined || raw === null) throw new CalculatorInputError(spec.name, "is required");
  if (typeof raw !== "number") throw new CalculatorInputError(spec.name, "must be a number");
  if (!Number.isFinite(raw)) throw new CalculatorInputError(spec.name, "must be finite");
  if (spec.min !== undefined) {
    if (spec.exclusiveMin ? raw <= spec.min : raw < spec.min) {
      throw new CalculatorInputError(spec.name, `must be ${spec.exclusiveMin ? "above" : "at least"} ${spec.min} ${spec.unit}`);
    }
  }
  if (spec.max !== undefined && raw > spec.max) {
    throw new CalculatorInputError(spec.name, `must be at most ${spec.max} ${spec.unit}`);
  }
  return raw;
}

/** Checks that every declared input is present, a finite number and in range; rejects unknown names. */
function validateCalculatorInputs(calc: Calculator, inputs: Record<string, unknown>): Record<string, number> {
  const known = new Set(calc.inputs.map((i) => i.name));
  for (const name of Object.keys(inputs)) {
    if (!known.has(name)) throw new CalculatorInputError(name, `is not an input of ${calc.id}`);
  }
  return Object.fromEntries(calc.inputs.map((spec) => [spec.name, validateOne(spec, inputs[spec.name])]));
}

/**
 * Validates and runs calculator `id`. Throws UnknownCalculatorError or CalculatorInputError (with
 * `field`). Warnings carry value-dependent validity limits; every result is an estimate, not a calibration.
 */
export function runCalculator(id: string, inputs: Record<string, unknown>): { outputs: Record<string, number>; warnings: string[] } {
  const calc = getCalculatorOrThrow(id);
  const values = validateCalculatorInputs(calc, inputs);
  const outputs = calc.compute(values);
  const warnings = calc.warn ? calc.warn(values, outputs) : [];
  for (const out of calc.outputs) {
    if (!Number.isFinite(outputs[out.name])) warnings.push(`${out.label} is not a finite number for these inputs.`);
  }
  return { outputs, warnings };
}
