"use client";
import { useQuery } from "@tanstack/react-query";
import { useState, type ReactNode } from "react";
import { roleAllows } from "@/lib/authz/policy";
import { fetchJson } from "@/components/api-client";
import { queryKeys, type FigureView, type MemberView } from "@/components/figures/api";
import { OpenThreads, ReviewStateBadge } from "@/components/figures/review-state";
import { SignoffBox } from "@/components/review/signoff-box";
import { FigureCanvas } from "./figure-canvas";
import { FigureSettings } from "./figure-settings";
import { PanelManager } from "./panel-manager";
import { TraceTable } from "./trace-table";

const EXPORTS = [
  { format: "svg", label: "SVG (vector)" },
  { format: "pdf", label: "PDF (vector)" },
  { format: "png", label: "PNG (300 dpi)" },
  { format: "source-data", label: "Source data" },
  { format: "bundle", label: "Reproducibility bundle" },
];

function Side({ title, children }: { title: string; children: ReactNode }) {
  return (
    <section className="rounded-sm border border-rule bg-sheet p-4" aria-label={title}>
      <h2 className="mb-2 text-sm font-semibold">{title}</h2>
      {children}
    </section>
  );
}

/** The figure page: the figure at print size in the centre; settings, panels, trace, sign-off and exports beside it. */
export function FigureWorkspace({ initial, members }: { initial: FigureView; members: MemberView[] }) {
  const { data: figure = initial } = useQuery({
    queryKey: queryKeys.figure(initial.id),
    queryFn: () => fetchJson<FigureView>(`/api/figures/${initial.id}`),
    initialData: initial,
    refetchInterval: 30_000,
  });
  const editable = roleAllows(figure.role, "figure.edit");
  const [traceOpen, setTraceOpen] = useState(false);
  const showTrace = () => {
    setTraceOpen(true);
    requestAnimationFrame(() => document.getElementById("trace")?.scrollIntoView({ behavior: "smooth", block: "start" }));
  };
  const open = figure.panels.reduce((n, p) => n + p.openThreads, 0);
  return (
    <>
      <header className="mb-5 flex flex-wrap items-end justify-between gap-3 border-b border-rule pb-3">
        <div>
          <h1 className="text-2xl font-semibold tracking-tight">
            Figure {figure.number} · {figure.title}
          </h1>
          <p className="mt-1 flex flex-wrap items-center gap-2 text-sm text-muted">
            <ReviewStateBadge state={figure.reviewState} />
            <span>
              {figure.panels.length} panel{figure.panels.length === 1 ? "" : "s"}
            </span>
            <OpenThreads count={open} />
          </p>
        </div>
      </header>
      <div className="grid grid-cols-1 gap-6 xl:grid-cols-[minmax(0,1fr)_300px]">
        <div className="min-w-0 space-y-4">
          <FigureCanvas figure={figure} />
          <TraceTable figureId={figure.id} open={traceOpen} onToggle={setTraceOpen} />
        </div>
        <aside className="space-y-4">
          <Side title="Panels">
            <PanelManager figure={figure} editable={editable} />
          </Side>
          <Side title="Sign-off">
            <SignoffBox
              figureId={figure.id}
              figureHash={figure.figureHash}
              reviewState={figure.reviewState}
              canSignOff={roleAllows(figure.role, "figure.signoff")}
              signoffs={figure.signoffs}
            />
          </Side>
          <Side title="Export">
            <ul className="space-y-1 text-sm">
              {EXPORTS.map((x) => (
                <li key={x.format}>
                  <a href={`/api/figures/${figure.id}/export?format=${x.format}`} className="underline" download>
                    {x.label}
                  </a>
                </li>
              ))}
            </ul>
          </Side>
          <Side title="Trace">
            <p className="text-sm">Raw file → analysis → revision, with every hash.</p>
            <p className="mt-1 flex gap-3 text-sm">
              <button type="button" className="underline" onClick={showTrace}>
                Show the trace
              </button>
              <a href={`/api/figures/${figure.id}/trace`} className="underline">
                as JSON
              </a>
            </p>
          </Side>
          <Side title="Figure settings">
            <FigureSettings key={`${figure.id}-${figure.widthMm}-${figure.columns}`} figure={figure} members={members} editable={editable} />
          </Side>
        </aside>
      </div>
    </>
  );
}
