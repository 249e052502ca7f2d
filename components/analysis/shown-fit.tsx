"use client";
import { Sheet } from "@/components/ui";
import type { FitResult } from "./api";
import { FitResultView } from "./fit-result";

/** The fit on show: a preview, or the stored run it became. */
export interface Shown {
  key: string;
  run: FitResult;
  modelTitle: string;
  xName: string;
  yName: string;
}

/** The fit on show, said to be a preview or stored, and whether the settings changed since. */
export function ShownFit({ shown, stale, onWindow }: { shown: Shown; stale: boolean; onWindow?: (range: [number, number]) => void }) {
  return (
    <section aria-labelledby="fit-result-heading">
      <Sheet>
        <h2 id="fit-result-heading" className="mb-3 text-lg font-semibold">
          {shown.modelTitle}
          <span className="ml-2 text-sm font-normal text-muted">{"id" in shown.run ? "— stored run" : "— preview, not stored"}</span>
          {stale ? (
            <span className="ml-2 text-sm font-normal text-warn">
              <span aria-hidden>⚠ </span>settings changed since this fit
            </span>
          ) : null}
        </h2>
        <FitResultView result={shown.run} modelTitle={shown.modelTitle} xName={shown.xName} yName={shown.yName} onWindow={onWindow} />
      </Sheet>
    </section>
  );
}
