"use client";
import { keepPreviousData, useQuery } from "@tanstack/react-query";
import { useId, useState } from "react";
import { axisTitle, formatCount } from "@/lib/data/format";
import { fetchJson } from "@/components/api-client";
import { Field, Select } from "@/components/ui";
import type { PlotData, VersionView } from "./api";
import { kindLabel } from "./measurement-kinds";
import { extent, isAscending } from "./plot-scales";
import { QuickPlot } from "./quick-plot";

const POINTS = 1200;

/**
 * Kinds whose x is a delay spanning decades (echo τ, relaxation wait): read on a log time axis, as
 * they are published. Ramsey fringes and spectra stay linear.
 */
const LOG_TIME_KINDS: ReadonlySet<string> = new Set(["hahn_echo", "relaxation"]);

type XScale = "linear" | "log";

/** Two column pickers, a linear/log x switch and the plot; the server downsamples, keeping extremes. */
export function QuickPlotPanel({ version, kind }: { version: VersionView; kind?: string }) {
  const numeric = version.columns.filter((c) => c.type === "number");
  const [x, setX] = useState(numeric[0]?.name ?? "");
  const [y, setY] = useState(numeric[1]?.name ?? numeric[0]?.name ?? "");
  const logByDefault = kind !== undefined && LOG_TIME_KINDS.has(kind);
  const [xScale, setXScale] = useState<XScale>(logByDefault ? "log" : "linear");
  const scaleName = `x-scale-${useId()}`;
  const { data, isFetching, isError, error } = useQuery({
    queryKey: ["plot", version.id, x, y, POINTS],
    queryFn: () => fetchJson<PlotData>(`/api/versions/${version.id}/plot?${new URLSearchParams({ x, y, points: String(POINTS) })}`),
    enabled: numeric.length >= 1 && Boolean(x && y),
    placeholderData: keepPreviousData,
    staleTime: Infinity,
  });

  if (numeric.length < 2) return <p className="text-sm text-muted">A quick plot needs two numeric columns; this version has {numeric.length}.</p>;
  const xRange = data ? extent([data.points.x]) : null;
  const canLog = xRange !== null && xRange[1] > 0;
  const logShown = xScale === "log" && canLog;
  const ordered = data ? isAscending(data.points.x) : true;

  return (
    <div>
      <div className="mb-3 flex flex-wrap items-end gap-3">
        <ColumnPicker label="x axis" columns={numeric} value={x} onChange={setX} />
        <ColumnPicker label="y axis" columns={numeric} value={y} onChange={setY} />
        <fieldset className="text-sm">
          <legend className="mb-1 font-medium">x scale</legend>
          <div className="inline-flex overflow-hidden rounded-sm border border-rule" data-testid="x-scale">
            {(["linear", "log"] as const).map((s) => {
              const on = s === "log" ? logShown : !logShown;
              const disabled = s === "log" && !canLog;
              return (
                <label
                  key={s}
                  className={`flex items-center gap-1.5 px-2.5 py-1 first:border-r first:border-rule ${on ? "bg-accent-soft font-semibold" : "bg-white"} ${disabled ? "text-muted" : "cursor-pointer"}`}
                >
                  <input
                    type="radio"
                    name={scaleName}
                    value={s}
                    checked={on}
                    disabled={disabled}
                    onChange={() => setXScale(s)}
                    className="h-3.5 w-3.5 accent-accent"
                  />
                  {s} x
                </label>
              );
            })}
          </div>
        </fieldset>
        <span className="pb-1.5 text-xs text-muted">
          {!canLog && data ? "log x needs positive x values" : logByDefault ? `log time axis by default for ${kindLabel(kind)} data` : ""}
        </span>
        <span className="pb-1.5 text-xs text-muted" aria-live="polite">
          {isFetching ? "loading…" : ""}
        </span>
      </div>
      {isError ? (
        <p role="alert" className="text-sm text-bad">
          <span aria-hidden>✕ </span>
          {error.message}
        </p>
      ) : null}
      {data ? <QuickPlot data={data} logX={logShown} /> : <div className="h-64 animate-pulse rounded-sm bg-paper" aria-hidden />}
      {data ? (
        <p className="mt-1 text-xs text-muted">
          {formatCount(data.rowCount)} rows · {formatCount(data.points.x.length)} points drawn
          {logShown && xRange && xRange[0] <= 0 ? " · points with x ≤ 0 are left out on log x" : ""}
          {data.downsampled ? (
            <span className="block" data-testid="downsampled-note">
              <span aria-hidden>◇ </span>
              {ordered
                ? "downsampled for display: min/max per pixel column, extremes kept"
                : "downsampled for display: x is not in order, so every k-th row is shown"}
            </span>
          ) : null}
        </p>
      ) : null}
    </div>
  );
}

function ColumnPicker({
  label,
  columns,
  value,
  onChange,
}: {
  label: string;
  columns: Array<{ name: string; unit: string | null }>;
  value: string;
  onChange: (name: string) => void;
}) {
  return (
    <div className="w-44">
      <Field label={label}>
        <Select value={value} onChange={(e) => onChange(e.target.value)}>
          {columns.map((c) => (
            <option key={c.name} value={c.name}>
              {axisTitle(c.name, c.unit)}
            </option>
          ))}
        </Select>
      </Field>
    </div>
  );
}
