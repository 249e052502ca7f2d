/** All fit models by id, in the order the UI offers them. */
import { exponentialModel, hahnEchoModel, relaxationModel, relaxationStretchedModel } from "./decay-models";
import { odmr14nTwoGroupsModel, odmr15nTwoGroupsModel } from "./odmr-hyperfine-groups";
import { odmr14nTripletModel, odmr15nDoubletModel, odmrLorentzianModels, odmrTwoResonancesModel } from "./odmr-models";
import { gaussianModel, lorentzianModel, pseudoVoigtModel, voigtModel } from "./peak-models";
import { lineModel, polynomial2Model, polynomial3Model } from "./polynomial-models";
import { g2AntibunchingModel, plSaturationModel } from "./emitter-models";
import { rabiGaussianModel, rabiModel } from "./rabi-models";
import { ramsey14nModel, ramseyModel } from "./ramsey-models";
import type { FitModel } from "./types";

const MODELS: readonly FitModel[] = [
  hahnEchoModel,
  relaxationModel,
  relaxationStretchedModel,
  ramseyModel,
  ramsey14nModel,
  rabiModel,
  rabiGaussianModel,
  plSaturationModel,
  g2AntibunchingModel,
  ...odmrLorentzianModels,
  odmr14nTripletModel,
  odmr15nDoubletModel,
  odmrTwoResonancesModel,
  odmr14nTwoGroupsModel,
  odmr15nTwoGroupsModel,
  exponentialModel,
  gaussianModel,
  lorentzianModel,
  pseudoVoigtModel,
  voigtModel,
  lineModel,
  polynomial2Model,
  polynomial3Model,
];

const BY_ID = new Map(MODELS.map((model) => [model.id, model]));

export function listModels(): readonly FitModel[] {
  return MODELS;
}

/** The model with this id, or undefined. */
export function findModel(id: string): FitModel | undefined {
  return BY_ID.get(id);
}
