/**
 * Pieces of the builder templates' option forms that recur from template to template: the data to
 * bind with its required columns, the σ column, the fitted curve, axis names and units, axis scales,
 * and the data names a template's spec reads.
 */
import { SCALE_CHOICES } from "./print";
import type { TemplateOptionField } from "./types";

/** The measured data (a dataset, option `dataName`) and the columns of it the plot cannot do without. */
export function dataOptions(label: string, dataDefault: string, columns: Array<[key: string, label: string, defaultColumn: string]>): TemplateOptionField[] {
  return [
    { key: "dataName", label, kind: "data-name", binds: "dataset", required: true, default: dataDefault },
    ...columns.map(([key, columnLabel, def]): TemplateOptionField => ({
      key,
      label: columnLabel,
      kind: "column",
      dataKey: "dataName",
      required: true,
      default: def,
    })),
  ];
}

/** Column of 1σ uncertainties of y, drawn as error bars. */
export const SIGMA_COLUMN_OPTION: TemplateOptionField = { key: "sigmaField", label: "σ column (error bars)", kind: "column", dataKey: "dataName" };

/** An analysis output (curve rows) drawn as the fitted line; option `fitName`. */
export function fittedCurveOption(dataDefault?: string): TemplateOptionField {
  return {
    key: "fitName",
    label: "Fitted curve",
    kind: "data-name",
    binds: "analysis-curve",
    ...(dataDefault === undefined ? {} : { default: dataDefault }),
    help: "leave empty for no fit",
  };
}

/** "<Axis> axis name" and, when given, "<Axis> unit" text options: [option key, default]. */
export function axisTextOptions(axis: string, name: [key: string, def: string], unit?: [key: string, def: string]): TemplateOptionField[] {
  return [
    { key: name[0], label: `${axis} axis name`, kind: "text", default: name[1] },
    ...(unit ? [{ key: unit[0], label: `${axis} unit`, kind: "text", default: unit[1] } as const] : []),
  ];
}

/** Linear, logarithmic or symmetric-log axis, linear unless chosen. */
export function scaleOption(key: string, label: string): TemplateOptionField {
  return { key, label, kind: "select", choices: SCALE_CHOICES, default: "linear" };
}

/**
 * A template's `dataNames`: the data names held by the given options (the defaults filling the
 * gaps), each once, empty ones (no fit, no residual strip) left out.
 */
export function dataNamesOf<O>(defaults: O, keys: Array<keyof O & string>): (input: Partial<O>) => string[] {
  return (input) => {
    const o = { ...defaults, ...input };
    return [...new Set(keys.map((k) => o[k]).filter((n): n is O[keyof O & string] & string => typeof n === "string" && n !== ""))];
  };
}
