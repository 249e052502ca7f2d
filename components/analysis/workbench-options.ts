import { bootstrapSettings, type BootstrapDraft } from "./bootstrap-fields";
import type { FitOptions } from "./api";
import type { BuildResult } from "./fit-options";
import { windowRange, type WindowDraft } from "./fit-window";

/** The bootstrap settings added to the built options (an error in them wins). */
export function withBootstrap(built: BuildResult, draft: BootstrapDraft): BuildResult {
  if (!("options" in built)) return built;
  const b = bootstrapSettings(draft);
  if ("error" in b) return { error: b.error };
  return b.settings ? { options: { ...built.options, bootstrap: b.settings } } : built;
}

/** The typed fit window added to the built options as xRange (an error in the window wins). */
export function withWindow(built: BuildResult, draft: WindowDraft): BuildResult {
  if (!("options" in built)) return built;
  const w = windowRange(draft);
  if ("error" in w) return { error: w.error };
  return w.range ? { options: { ...built.options, xRange: w.range } } : built;
}

/** The columns and typed window the comparison fits, or what is wrong with the window. */
export function comparisonColumns(
  cols: { x: string; y: string; sigma: string },
  draft: WindowDraft,
): Pick<FitOptions, "x" | "y" | "sigma" | "xRange"> | { error: string } {
  const w = windowRange(draft);
  if ("error" in w) return { error: w.error };
  return { x: cols.x, y: cols.y, ...(cols.sigma ? { sigma: cols.sigma } : {}), ...(w.range ? { xRange: w.range } : {}) };
}
