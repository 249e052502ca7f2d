/** Types of align-core.mjs. */
import type { GridCell } from "./compose-core.mjs";
import type { ExtraPadding, PlotMargins } from "./render-core.mjs";

export declare const ALIGN_TOLERANCE_PT: number;
export declare function alignmentPadding(panels: Array<{ plot: PlotMargins | null; height: number }>, cells: GridCell[]): Required<ExtraPadding>[];
export declare function isAligned(padding: Required<ExtraPadding>[]): boolean;
