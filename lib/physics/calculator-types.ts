/**
 * Shared shapes for the physics calculators. Inputs and outputs use SI-prefixed practical units
 * (MHz, mT, nm, nT, µs …) named in each field's `unit`; the pure functions underneath use SI.
 */

/** The caution every calculator carries (DESIGN.md §8). */
export const ESTIMATE_CAUTION = "An estimate, not a calibration.";

export interface CalculatorInput {
  name: string;
  label: string;
  unit: string;
  /** Suggested value for a form; runCalculator never fills it in silently. */
  default?: number;
  /** Inclusive lower bound unless `exclusiveMin` is true. */
  min?: number;
  /** Inclusive upper bound. */
  max?: number;
  /** When true, the value must be strictly greater than `min`. */
  exclusiveMin?: boolean;
}

interface CalculatorOutput {
  name: string;
  label: string;
  unit: string;
}

export interface Calculator {
  id: string;
  title: string;
  formula: string;
  assumptions: string[];
  source: string;
  inputs: CalculatorInput[];
  outputs: CalculatorOutput[];
  compute(inputs: Record<string, number>): Record<string, number>;
  /** Warnings that depend on the values (validity limits, ambiguities). */
  warn?(inputs: Record<string, number>, outputs: Record<string, number>): string[];
}

/** Thrown for a missing, non-numeric, non-finite, out-of-range or unknown input. */
export class CalculatorInputError extends Error {
  readonly field: string;
  constructor(field: string, message: string) {
    super(`${field}: ${message}`);
    this.name = "CalculatorInputError";
    this.field = field;
  }
}

/** Thrown when no calculator has the requested id. */
export class UnknownCalculatorError extends Error {
  readonly calculatorId: string;
  constructor(id: string) {
    super(`unknown calculator "${id}"`);
    this.name = "UnknownCalculatorError";
    this.calculatorId = id;
  }
}

/** Builds an assumptions list that always starts with the shared caution. */
export function withCaution(...assumptions: string[]): string[] {
  return [ESTIMATE_CAUTION, ...assumptions];
}
