"use client";
import { useQuery } from "@tanstack/react-query";
import { useState, type ReactNode } from "react";
import { roleAllows } from "@/lib/authz/policy";
import { fetchJson } from "@/components/api-client";
import { queryKeys, type FigureView, type MemberView } from "@/components/figures/api";
import { PrintCheckList } from "@/components/figures/print-check-list";
import { OpenThreads, ReviewStateBadge } from "@/components/figures/review-state";
import { SignoffBox } from "@/components/review/signoff-box";
import { formatDate } from "@/lib/data/format";
import { STATE_LABELS } from "@/lib/review/derive-state";
import { ExportLinks } from "./export-links";
import { FigureCanvas } from "./figure-canvas";
import { FigureSettings } from "./figure-settings";
import { PanelManager } from "./panel-manager";
import { TraceTable } from "./trace-table";
import { usePrintedAt } from "./use-printing";

function Side({ title, children }: { title: string; children: ReactNode }) {
  return (
    <section className="rounded-sm border border-rule bg-sheet p-4" aria-label={title}>
      <h2 className="mb-2 text-sm font-semibold">{title}</h2>
      {children}
    </section>
  );
}

/**
 * The figure page: the figure at print size in the centre; settings, panels, trace, sign-off and exports beside it.
 * Printed (print: variants), only the figure at its true width in mm, its number and title, and a caption line.
 */
export function FigureWorkspace({ initial, members, manuscriptTitle }: { initial: FigureView; members: MemberView[]; manuscriptTitle: string }) {
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
  const printedAt = usePrintedAt();
  return (
    <>
      <header className="mb-5 flex flex-wrap items-end justify-between gap-3 border-b border-rule pb-3 print:mb-[3mm] print:border-0 print:pb-0">
        <div>
          <h1 className="text-2xl font-semibold tracking-tight print:text-[11pt]">
            Figure {figure.number} · {figure.title}
          </h1>
          <p className="mt-1 flex flex-wrap items-center gap-2 text-sm text-muted print:hidden">
            <ReviewStateBadge state={figure.reviewState} />
            <span>
              {figure.panels.length} panel{figure.panels.length === 1 ? "" : "s"}
            </span>
            <OpenThreads count={open} />
          </p>
        </div>
      </header>
      <div className="grid grid-cols-1 gap-6 xl:grid-cols-[minmax(0,1fr)_300px] print:block">
        <div className="min-w-0 space-y-4">
          <FigureCanvas figure={figure} />
          <p className="hidden print:mt-[3mm] print:block print:text-[8pt] print:text-muted" data-testid="print-caption">
            {manuscriptTitle} · {STATE_LABELS[figure.reviewState].label} · printed {printedAt !== null ? formatDate(printedAt) : null}
          </p>
          <div className="print:hidden">
            <TraceTable figureId={figure.id} open={traceOpen} onToggle={setTraceOpen} />
          </div>
        </div>
        {/* Below xl the side sections sit under the figure, two abreast from md. */}
        <aside className="grid min-w-0 grid-cols-1 content-start gap-4 md:grid-cols-2 xl:grid-cols-1 print:hidden">
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
          <Side title="Print check">
            <PrintCheckList figureId={figure.id} figureHash={figure.figureHash} mayKeepOlder={editable} />
          </Side>
          <Side title="Export">
            <ExportLinks figure={figure} />
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
