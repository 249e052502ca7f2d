"use client";
import { useQuery } from "@tanstack/react-query";
import { useState } from "react";
import { axisTitle } from "@/lib/data/format";
import { fetchJson } from "@/components/api-client";
import { EmptyState, Field, Notice, Select } from "@/components/ui";
import type { ModelInfo, PopulationStats } from "./api";
import { ComparisonsTable, GroupsTable } from "./statistics-tables";
import { StripPlot } from "./strip-plot";

/** A time, rate or position is what people compare between groups; baselines rarely. */
function defaultParameter(model: ModelInfo): string {
  return (model.parameters.find((p) => p.unit === "x") ?? model.parameters.find((p) => p.unit !== "y") ?? model.parameters[0])?.name ?? "";
}

/** One fitted parameter over the latest run on every dataset's current version, grouped, with every pair compared. */
export function PopulationStatistics({
  manuscriptId,
  model,
  groupings,
  refreshKey,
}: {
  manuscriptId: string;
  model: ModelInfo;
  groupings: string[];
  refreshKey: number;
}) {
  const [chosen, setChosen] = useState<{ model: string; parameter: string } | null>(null);
  const parameter = chosen?.model === model.id ? chosen.parameter : defaultParameter(model);
  const [groupBy, setGroupBy] = useState(groupings.includes("group") ? "group" : (groupings[0] ?? "kind"));
  const q = new URLSearchParams({ model: model.id, parameter, groupBy });
  const stats = useQuery({
    queryKey: ["statistics", manuscriptId, model.id, parameter, groupBy, refreshKey],
    queryFn: () => fetchJson<PopulationStats>(`/api/manuscripts/${manuscriptId}/statistics?${q}`),
    enabled: Boolean(parameter),
  });
  const data = stats.data;
  return (
    <div className="space-y-4">
      <div className="grid gap-4 sm:grid-cols-[220px_220px_1fr] sm:items-end">
        <Field label="Parameter">
          <Select value={parameter} onChange={(e) => setChosen({ model: model.id, parameter: e.target.value })}>
            {model.parameters.map((p) => (
              <option key={p.name} value={p.name}>
                {p.name} — {p.description}
              </option>
            ))}
          </Select>
        </Field>
        <Field label="Group by">
          <Select value={groupBy} onChange={(e) => setGroupBy(e.target.value)}>
            {groupings.map((g) => (
              <option key={g} value={g}>
                {g}
              </option>
            ))}
          </Select>
        </Field>
        <p className="pb-2 text-xs text-muted">Model {model.title}: the latest run on each dataset&apos;s current version counts.</p>
      </div>
      {stats.isPending ? (
        <p className="text-sm text-muted" role="status">
          Loading statistics…
        </p>
      ) : null}
      {stats.error ? <Notice ok={false}>{stats.error.message}</Notice> : null}
      {data && !data.members.length ? (
        <EmptyState title={`No stored ${model.id} runs yet`}>Run the batch above (or save fits one by one) to see the population.</EmptyState>
      ) : null}
      {data && data.members.length ? (
        <>
          <p className="text-sm" data-testid="statistics-summary">
            {data.members.length} fitted values of <span className="font-mono">{data.parameter}</span>
            {data.unit ? ` (${data.unit})` : ""} in {data.groups.length} group{data.groups.length === 1 ? "" : "s"} by {data.groupBy}.
          </p>
          <div className="max-w-3xl">
            <StripPlot stats={data} yTitle={axisTitle(data.parameter, data.unit)} />
          </div>
          <GroupsTable stats={data} />
          <ComparisonsTable stats={data} />
          <div className="rounded-sm border border-rule bg-paper px-3 py-2 text-xs text-muted">
            <h3 className="mb-1 font-semibold text-ink">Methods</h3>
            <p>{data.methods.describe}</p>
            <p className="mt-1">{data.methods.compare}</p>
          </div>
        </>
      ) : null}
    </div>
  );
}
