"use client";
import Link from "next/link";
import { useQuery, useQueryClient } from "@tanstack/react-query";
import { useState } from "react";
import { ArchiveToggleButton, ShowArchivedToggle } from "@/components/archive/archive-controls";
import { fetchJson } from "@/components/api-client";
import { EmptyState } from "@/components/ui";
import { formatDate, formatNumber, formatValueError } from "@/lib/data/format";
import type { FitParameter, ModelInfo, StoredResult, StoredRun } from "./api";
import { Converged } from "./fit-result";

/** The parameters worth a glance (times, rates, positions, exponents), not baselines and amplitudes in y units. */
function keyParameters(model: ModelInfo | undefined, params: readonly FitParameter[]): FitParameter[] {
  if (!model) return [...params];
  const roles = new Map(model.parameters.map((p) => [p.name, p.unit as string]));
  const key = params.filter((p) => roles.get(p.name) !== "y");
  return key.length ? key : [...params];
}

function ParameterSummary({ params }: { params: readonly FitParameter[] }) {
  return (
    <span className="flex flex-wrap gap-x-4 gap-y-0.5">
      {params.map((p) => (
        <span key={p.name} className="whitespace-nowrap tabular-nums">
          <span className="font-mono">{p.name}</span> = {formatValueError(p.value, p.fixed ? null : p.stderr)}
          {p.unit ? ` ${p.unit}` : ""}
          {p.fixed ? " (fixed)" : ""}
        </span>
      ))}
    </span>
  );
}

/** Runs stored on this version, newest first; with `versionId`, a "Show archived" switch lists the archived ones instead. */
export function StoredRuns({
  runs,
  models,
  versionId,
  mayArchive = false,
  onUseWindow,
}: {
  runs: StoredRun[];
  models: readonly ModelInfo[];
  versionId?: string;
  mayArchive?: boolean;
  /** Puts a run's fit window into the form, for refitting with it. */
  onUseWindow?: (range: [number, number]) => void;
}) {
  const queryClient = useQueryClient();
  const [showArchived, setShowArchived] = useState(false);
  const archived = useQuery({
    queryKey: ["version-analyses", versionId, "archived"],
    enabled: Boolean(versionId) && showArchived,
    queryFn: () => fetchJson<{ items: StoredRun[] }>(`/api/versions/${versionId}/analyses?archived=1`),
  });
  const shown = showArchived ? (archived.data?.items ?? []) : runs;
  const refresh = () => void queryClient.invalidateQueries({ queryKey: ["version-analyses", versionId] });
  const toggle = versionId ? (
    <p className="mb-2">
      <ShowArchivedToggle checked={showArchived} onChange={setShowArchived} />
    </p>
  ) : null;
  if (!shown.length)
    return (
      <>
        {toggle}
        {showArchived ? (
          <EmptyState title="No archived runs on this version" />
        ) : (
          <EmptyState title="No stored runs on this version yet">A saved fit appears here with its parameters and a derived version.</EmptyState>
        )}
      </>
    );
  const byId = new Map(models.map((m) => [m.id, m]));
  return (
    <div className="relative overflow-x-auto">
      {toggle}
      <table className="w-full border border-rule bg-sheet text-sm" aria-label={showArchived ? "Archived runs on this version" : "Stored runs on this version"}>
        <thead className="bg-paper text-left text-xs uppercase tracking-wide text-muted">
          <tr>
            <th className="px-3 py-2">When</th>
            <th className="px-3 py-2">Model</th>
            <th className="px-3 py-2">Result</th>
            <th className="px-3 py-2 normal-case">χ²ᵣ</th>
            <th className="px-3 py-2">Solver</th>
            <th className="px-3 py-2">Derived</th>
            {mayArchive ? <th className="px-3 py-2">Archive</th> : null}
          </tr>
        </thead>
        <tbody className="divide-y divide-rule">
          {shown.map((r) => {
            const result = r.result as StoredResult;
            const model = byId.get(r.model);
            return (
              <tr key={r.id}>
                <td className="whitespace-nowrap px-3 py-2 text-muted">{formatDate(r.createdAt)}</td>
                <td className="px-3 py-2">
                  {model?.title ?? r.model}
                  <span className="block text-xs text-muted">
                    {r.model} · v{r.modelVersion}
                  </span>
                </td>
                <td className="px-3 py-2">
                  <ParameterSummary params={keyParameters(model, result.parameters ?? [])} />
                  <RunWindow run={r} onUse={onUseWindow} />
                </td>
                <td className="px-3 py-2 tabular-nums">{formatNumber(result.chi2red, 3)}</td>
                <td className="whitespace-nowrap px-3 py-2">
                  <Converged ok={result.converged} quality={result.quality} />
                </td>
                <td className="whitespace-nowrap px-3 py-2">{r.derivedVersionId ? <DerivedLink versionId={r.derivedVersionId} /> : "—"}</td>
                {mayArchive ? (
                  <td className="px-3 py-2">
                    <ArchiveToggleButton kind="analysis" id={r.id} archived={showArchived} onDone={refresh} />
                  </td>
                ) : null}
              </tr>
            );
          })}
        </tbody>
      </table>
    </div>
  );
}

/** The derived version of a run (curve, data, residuals), linked on its dataset page. */
function DerivedLink({ versionId }: { versionId: string }) {
  const v = useQuery({
    queryKey: ["version", versionId],
    queryFn: () => fetchJson<{ number: number; datasetId: string }>(`/api/versions/${versionId}`),
    staleTime: Infinity,
  });
  if (!v.data) return <span className="text-muted">…</span>;
  return (
    <Link href={`/datasets/${v.data.datasetId}?v=${versionId}`} className="underline">
      version {v.data.number}
    </Link>
  );
}

/** The run's fit window (options.xRange) in the x column's unit, with a button to refit with it. */
function RunWindow({ run, onUse }: { run: StoredRun; onUse?: (range: [number, number]) => void }) {
  const range = (run.options as { xRange?: [number, number] }).xRange;
  if (!range) return null;
  const unit = (run.result as { units?: { x?: string | null } }).units?.x;
  return (
    <span className="mt-1 flex flex-wrap items-center gap-2 text-xs text-muted" data-testid="run-window">
      Fit window {range[0]} – {range[1]}
      {unit ? ` ${unit}` : ""}
      {onUse ? (
        <button type="button" className="underline" onClick={() => onUse(range)}>
          Use this window
        </button>
      ) : null}
    </span>
  );
}
