"use client";
import { useState } from "react";
import { Sheet } from "@/components/ui";
import type { ModelInfo } from "./api";
import { BatchRunner } from "./batch-runner";
import { orderModels } from "./fit-options";
import type { BatchDataset } from "./batch-types";
import { GlobalFit } from "./global-fit";
import { PopulationStatistics } from "./population-statistics";

/** The batch of fits and the population statistics of the same model, refreshed when a batch ends. */
export function AnalysesWorkspace({
  manuscriptId,
  datasets,
  models,
  groupings,
  mayRun,
}: {
  manuscriptId: string;
  datasets: BatchDataset[];
  models: ModelInfo[];
  groupings: string[];
  mayRun: boolean;
}) {
  const [modelId, setModelId] = useState(models.some((m) => m.id === "hahn_echo") ? "hahn_echo" : models[0].id);
  const [kind, setKind] = useState(datasets.some((d) => d.kind === "hahn_echo") ? "hahn_echo" : (datasets[0]?.kind ?? "hahn_echo"));
  const [refreshKey, setRefreshKey] = useState(0);
  const model = models.find((m) => m.id === modelId)!;

  function pickModel(id: string) {
    setModelId(id);
    const next = models.find((m) => m.id === id);
    const fitting = next?.kinds.find((k) => datasets.some((d) => d.kind === k));
    if (next && !next.kinds.includes(kind) && fitting) setKind(fitting);
  }

  function pickKind(k: string) {
    setKind(k);
    const suggested = orderModels(models, k).suggested[0];
    if (!model.kinds.includes(k) && suggested) setModelId(suggested.id);
  }

  return (
    <div className="space-y-6">
      <section aria-labelledby="batch-heading">
        <Sheet>
          <h2 id="batch-heading" className="mb-3 text-lg font-semibold">
            Batch fits
          </h2>
          <BatchRunner
            key={kind}
            manuscriptId={manuscriptId}
            datasets={datasets}
            models={models}
            model={model}
            onModel={pickModel}
            kind={kind}
            onKind={pickKind}
            mayRun={mayRun}
            onFinished={() => setRefreshKey((k) => k + 1)}
          />
        </Sheet>
      </section>
      <section id="global-fit" aria-labelledby="global-heading" className="scroll-mt-4">
        <Sheet>
          <h2 id="global-heading" className="mb-3 text-lg font-semibold">
            Global fit
          </h2>
          <GlobalFit manuscriptId={manuscriptId} datasets={datasets} models={models} mayRun={mayRun} />
        </Sheet>
      </section>
      <section aria-labelledby="statistics-heading">
        <Sheet>
          <h2 id="statistics-heading" className="mb-3 text-lg font-semibold">
            Population statistics
          </h2>
          <PopulationStatistics manuscriptId={manuscriptId} model={model} groupings={groupings} refreshKey={refreshKey} />
        </Sheet>
      </section>
    </div>
  );
}
