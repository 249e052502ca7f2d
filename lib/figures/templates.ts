/**
 * Builder templates for the field's plots. Each produces ordinary Vega-Lite (v6 schema) that the
 * user can then edit; data is referenced by name only and bound per revision. Sizes are in
 * points at print size (see ./plots/print).
 */
import { decayCurveTemplate } from "./plots/decay-curve";
import { groupStripTemplate } from "./plots/group-strip";
import { plMapTemplate } from "./plots/pl-map";
import { pulseScalingTemplate } from "./plots/pulse-scaling";
import { scatterLineTemplate } from "./plots/scatter-line";
import { nvNmrTemplate, spectrumTemplate } from "./plots/spectrum";
import type { CommonOptions, FigureTemplate } from "./plots/types";

export * from "./plots/print";
export * from "./plots/types";
export { DECAY_CURVE_DEFAULTS, decayCurveTemplate } from "./plots/decay-curve";
export { expectedNucleusMarker, spectrumTemplate } from "./plots/spectrum";

// The registry is heterogeneous: each template fills and checks its own options when it builds.
export const FIGURE_TEMPLATES: ReadonlyArray<FigureTemplate<any>> = [
  decayCurveTemplate,
  spectrumTemplate,
  plMapTemplate,
  groupStripTemplate,
  nvNmrTemplate,
  scatterLineTemplate,
  pulseScalingTemplate,
];

export function getTemplate(id: string): FigureTemplate<CommonOptions> | undefined {
  return FIGURE_TEMPLATES.find((t) => t.id === id);
}
