"use client";
import { useRef, useState } from "react";
import { postForEvents } from "@/components/api-client";
import { Button, Field, Notice, Select } from "@/components/ui";
import type { BatchEvent, ModelInfo } from "./api";
import { BatchProgress } from "./batch-progress";
import { BatchResults, type BatchOutcome } from "./batch-results";
import { DatasetChecklist } from "./dataset-checklist";
import type { BatchDataset } from "./batch-types";
import { defaultColumns } from "./fit-options";
import { ColumnSelects, kindWords, ModelSelect } from "./model-and-columns";

interface Props {
  manuscriptId: string;
  datasets: BatchDataset[];
  models: ModelInfo[];
  model: ModelInfo;
  onModel: (id: string) => void;
  kind: string;
  onKind: (kind: string) => void;
  mayRun: boolean;
  onFinished: () => void;
}

/**
 * Runs one model (remounted per kind, so ticks and columns start fresh) over the current version
 * of every ticked dataset of a kind on the server's fit pool, storing each run; rows fill in as
 * fits finish. Stop closes the connection: no further fit starts.
 */
export function BatchRunner({ manuscriptId, datasets, models, model, onModel, kind, onKind, mayRun, onFinished }: Props) {
  const matching = datasets.filter((d) => d.kind === kind);
  const kinds = [...new Set(datasets.map((d) => d.kind))].sort();
  const [unticked, setUnticked] = useState<Set<string>>(new Set());
  const [cols, setCols] = useState(() => defaultColumns(matching[0]?.columns ?? []));
  const [outcomes, setOutcomes] = useState<BatchOutcome[]>([]);
  const [progress, setProgress] = useState<{ done: number; total: number; failed: number } | null>(null);
  const [running, setRunning] = useState(false);
  const [ranModel, setRanModel] = useState(model);
  const stop = useRef<AbortController | null>(null);
  const [note, setNote] = useState<string | null>(null);
  const chosen = matching.filter((d) => !unticked.has(d.id));

  function toggle(id: string, on: boolean) {
    setUnticked((s) => {
      const n = new Set(s);
      if (on) n.delete(id);
      else n.add(id);
      return n;
    });
  }

  async function run() {
    const queue = chosen;
    const byVersion = new Map(queue.map((d) => [d.versionId, d]));
    const stopper = new AbortController();
    stop.current = stopper;
    setRunning(true);
    setOutcomes([]);
    setRanModel(model);
    setNote(null);
    let done = 0;
    let failed = 0;
    setProgress({ done, total: queue.length, failed });
    const options = { x: cols.x, y: cols.y, ...(cols.sigma ? { sigma: cols.sigma } : {}) };
    try {
      await postForEvents<BatchEvent>(
        "/api/analyses/batch",
        { manuscriptId, versionIds: queue.map((d) => d.versionId), model: model.id, options },
        (event) => {
          if (event.type === "start") setNote(`Fitting on ${event.workers} core${event.workers === 1 ? "" : "s"} of the server.`);
          if (event.type === "end" && event.cancelled) setNote(`Stopped: ${event.cancelled} fit${event.cancelled === 1 ? " was" : "s were"} not started.`);
          if (event.type !== "result") return;
          const dataset = byVersion.get(event.versionId)!;
          done++;
          if (!event.ok) failed++;
          const outcome = event.ok ? { dataset, run: event.run } : { dataset, error: event.error };
          // Fits finish in any order; rows keep the order of the list above.
          setOutcomes((o) => [...o, outcome].sort((a, b) => queue.indexOf(a.dataset) - queue.indexOf(b.dataset)));
          setProgress({ done, total: queue.length, failed });
        },
        stopper.signal,
      );
    } catch (err) {
      if (!stopper.signal.aborted) setNote((err as Error).message);
      else
        setNote(
          `Stopped: ${queue.length - done} fit${queue.length - done === 1 ? " was" : "s were"} not finished here (fits already under way are still stored).`,
        );
    }
    setRunning(false);
    onFinished();
  }

  const sigmaDefault = cols.sigma ? `weighted by ${cols.sigma}` : "unweighted";
  return (
    <div className="space-y-4">
      <div className="grid gap-4 lg:grid-cols-[minmax(0,1fr)_minmax(0,1fr)]">
        <ModelSelect models={models} kind={kind} value={model.id} onChange={onModel} />
        <div className="space-y-4">
          <Field label="Measurement kind">
            <Select value={kind} onChange={(e) => onKind(e.target.value)}>
              {kinds.map((k) => (
                <option key={k} value={k}>
                  {kindWords(k)} ({datasets.filter((d) => d.kind === k).length})
                </option>
              ))}
            </Select>
          </Field>
          <ColumnSelects columns={matching[0]?.columns ?? []} value={cols} onChange={setCols} />
        </div>
      </div>
      <DatasetChecklist
        legend={`Datasets to fit — current versions (${chosen.length} of ${matching.length} ticked)`}
        kind={kind}
        datasets={matching}
        ticked={(id) => !unticked.has(id)}
        onToggle={toggle}
        disabled={running}
      />
      {mayRun ? (
        <div className="flex flex-wrap items-center gap-3">
          <Button type="button" onClick={() => void run()} disabled={running || !chosen.length || !cols.x || !cols.y}>
            {running ? "Fitting…" : `Run ${chosen.length} fit${chosen.length === 1 ? "" : "s"}`}
          </Button>
          {running ? (
            <Button
              type="button"
              variant="quiet"
              onClick={() => {
                stop.current?.abort();
              }}
            >
              Stop
            </Button>
          ) : null}
          <span className="text-xs text-muted">Each run is stored with a derived version ({sigmaDefault}; automatic start values and default bounds).</span>
        </div>
      ) : (
        <p className="text-sm text-muted">
          <span aria-hidden>○ </span>Only the PI and authors run analyses; the statistics below are open to every member.
        </p>
      )}
      {progress ? <BatchProgress {...progress} /> : null}
      {note ? <p className="text-xs text-muted">{note}</p> : null}
      {progress && !running && progress.failed ? (
        <Notice ok={false}>
          {progress.failed} of {progress.total} fits failed; the reason is in each row.
        </Notice>
      ) : null}
      {outcomes.length ? <BatchResults outcomes={outcomes} model={ranModel} groupTag="group" /> : null}
    </div>
  );
}
