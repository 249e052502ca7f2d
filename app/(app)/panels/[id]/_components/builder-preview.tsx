"use client";
import type { BoundRows } from "@/components/figures/api";
import { PanelChartLazy } from "@/components/figures/panel-chart-lazy";

/** The builder's live preview with the chosen (or saved) data. */
export function BuilderPreview({
  spec,
  data,
  saved,
  error,
  widthMm,
}: {
  spec: unknown;
  data: Record<string, BoundRows> | undefined;
  saved: boolean;
  error: Error | null;
  widthMm: number;
}) {
  return (
    <section aria-label="Builder preview">
      <h3 className="mb-1 text-sm font-semibold">
        Preview <span className="font-normal text-muted">{saved ? "with the saved data" : "with the chosen data (first 10,000 rows)"}</span>
      </h3>
      <div className="overflow-x-auto rounded-sm border border-rule bg-white p-2" data-testid="builder-preview">
        {spec ? (
          <PanelChartLazy spec={spec} data={data} widthMm={widthMm} label="Preview of the builder's spec" />
        ) : (
          <p className="text-sm text-muted">The preview appears when the data are chosen.</p>
        )}
      </div>
      {error ? (
        <p role="alert" className="mt-1 text-xs text-bad">
          ✕ {error.message}
        </p>
      ) : null}
    </section>
  );
}
