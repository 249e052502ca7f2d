import { FitInputError } from "./fit-input-error";
import { findModel, listModels } from "./models/registry";
import type { FitModel } from "./models/types";

export { listModels };

/** The model with this id, or undefined. */
export function getModel(id: string): FitModel | undefined {
  return findModel(id);
}

export function getModelOrThrow(idOrModel: string | FitModel): FitModel {
  if (typeof idOrModel !== "string") return idOrModel;
  const model = findModel(idOrModel);
  if (!model) throw new FitInputError(`unknown model "${idOrModel}"`, "modelId");
  return model;
}
