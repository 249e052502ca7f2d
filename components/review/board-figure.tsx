"use client";
import Link from "next/link";
import { FigureThumbnail } from "@/components/figures/figure-thumbnail";
import { RelativeTime } from "./relative-time";
import { figureLastActivity, panelLastActivity, type LastActivity } from "./last-activity";
import type { ActivityEntry, BoardFigure, BoardPanel } from "./review-api";
import { SignoffBox } from "./signoff-box";
import { StateBadge } from "./state-badge";

type Names = Map<string, string>;
const list = (ids: string[], names: Names) => ids.map((id) => names.get(id) ?? "a former member").join(", ");

/** One label/value pair of a `<dl>`: the people named, or `empty` ("—", read as "nobody"). */
function People({ label, ids, names, testId, empty }: { label: string; ids: string[]; names: Names; testId?: string; empty?: string }) {
  return (
    <div className="flex gap-1.5" data-testid={testId}>
      <dt className="shrink-0 text-muted">{label}</dt>
      <dd className="min-w-0">
        {ids.length ? (
          list(ids, names)
        ) : empty ? (
          <span className="text-muted">{empty}</span>
        ) : (
          <span className="text-muted">
            <span aria-hidden>—</span>
            <span className="sr-only">nobody</span>
          </span>
        )}
      </dd>
    </div>
  );
}

function Last({ last }: { last: LastActivity | null }) {
  if (!last) return <span className="text-muted">—</span>;
  return (
    <span className="min-w-0">
      <RelativeTime at={last.at} />
      {last.who || last.text ? (
        <span className="block truncate text-muted" title={`${last.who ?? ""} ${last.text ?? ""}`.trim()}>
          {last.who ? `${last.who} ` : ""}
          {last.text}
        </span>
      ) : null}
    </span>
  );
}

function PanelCell({ p, names, byTarget }: { p: BoardPanel; names: Names; byTarget: Map<string, ActivityEntry> }) {
  const rev = p.currentRevision;
  return (
    <li
      className="flex min-w-0 flex-col gap-2 rounded-sm border border-rule bg-sheet p-3"
      data-testid={`panel-cell-${p.letter}`}
      aria-label={`Panel ${p.letter}`}
    >
      <div className="flex flex-wrap items-start justify-between gap-x-2 gap-y-1">
        <Link href={`/panels/${p.id}`} className="min-w-0 flex-1 hover:underline">
          <span className="mr-0.5 font-semibold">{p.letter}</span> <span className="text-muted">{p.title || "untitled panel"}</span>
        </Link>
        <StateBadge state={p.reviewState} className="shrink-0" />
      </div>
      <p className="text-xs text-muted">
        {rev ? <>revision {rev.number}</> : "no revision yet"} ·{" "}
        <span className={p.openThreads ? "font-medium text-ink" : ""} data-testid="open-threads">
          {p.openThreads} open thread{p.openThreads === 1 ? "" : "s"}
        </span>
        {p.dataWarnings ? (
          <span className="block font-medium text-warn" data-testid="panel-data-warnings">
            <span aria-hidden>△ </span>
            {p.dataWarnings} data warning{p.dataWarnings === 1 ? "" : "s"} — open the panel to read {p.dataWarnings === 1 ? "it" : "them"}
          </span>
        ) : null}
      </p>
      <dl className="space-y-0.5 text-xs">
        <People label="Approved by" ids={p.approvedBy} names={names} testId="approved-by" />
        <People label="Waiting on" ids={p.waitingOn} names={names} testId="waiting-on" />
        {p.needsRevisionBy.length ? <People label="Asked for changes" ids={p.needsRevisionBy} names={names} /> : null}
        <div className="flex gap-1.5">
          <dt className="shrink-0 text-muted">Last activity</dt>
          <dd className="min-w-0">
            <Last last={panelLastActivity(p, byTarget)} />
          </dd>
        </div>
      </dl>
    </li>
  );
}

/** One figure as a row: what it is and its sign-off on the left, its panels as cells on the right. */
export function BoardFigureRow({ f, names, byTarget, isPi }: { f: BoardFigure; names: Names; byTarget: Map<string, ActivityEntry>; isPi: boolean }) {
  const open = f.panels.reduce((n, p) => n + p.openThreads, 0);
  const warned = f.panels.filter((p) => p.dataWarnings > 0).length;
  const last = figureLastActivity(f, byTarget);
  return (
    <li
      className="grid grid-cols-[minmax(0,1fr)] gap-4 border-t border-rule py-5 first:border-t-0 md:grid-cols-[17rem_minmax(0,1fr)]"
      aria-labelledby={`figure-${f.id}`}
      data-testid={`figure-row-${f.number}`}
    >
      <div className="space-y-3">
        <div>
          <h2 id={`figure-${f.id}`} className="font-semibold">
            <Link href={`/figures/${f.id}`} className="hover:underline">
              Figure {f.number}
            </Link>
          </h2>
          <p className="text-sm">{f.title}</p>
        </div>
        <FigureThumbnail figure={f} width={240} height={150} />
        <dl className="space-y-0.5 text-xs">
          <div className="flex gap-1.5">
            <dt className="text-muted">State</dt>
            <dd>
              <StateBadge state={f.reviewState} />
            </dd>
          </div>
          <div className="flex gap-1.5">
            <dt className="text-muted">Panels</dt>
            <dd>
              {f.panels.length} · {open} open thread{open === 1 ? "" : "s"}
              {warned ? (
                <>
                  {" "}
                  ·{" "}
                  <span className="text-warn">
                    <span aria-hidden>△ </span>
                    {warned} with data warnings
                  </span>
                </>
              ) : null}
            </dd>
          </div>
          <People label="Required reviewers" ids={f.requiredReviewers} names={names} empty="none named: one approval per panel suffices" />
          <div className="flex gap-1.5">
            <dt className="shrink-0 text-muted">Last activity</dt>
            <dd className="min-w-0">
              <Last last={last} />
            </dd>
          </div>
        </dl>
        {isPi || f.signoffs.length ? (
          <section aria-label={`Sign-off of figure ${f.number}`} className="rounded-sm border border-rule bg-sheet p-4">
            <h3 className="mb-2 text-sm font-semibold">Sign-off</h3>
            <SignoffBox figureId={f.id} figureHash={f.figureHash} reviewState={f.reviewState} canSignOff={isPi} signoffs={f.signoffs} />
          </section>
        ) : null}
      </div>
      {f.panels.length ? (
        <ul className="grid content-start gap-3 sm:grid-cols-[repeat(auto-fill,minmax(14rem,1fr))]" aria-label={`Panels of figure ${f.number}`}>
          {f.panels.map((p) => (
            <PanelCell key={p.id} p={p} names={names} byTarget={byTarget} />
          ))}
        </ul>
      ) : (
        <p className="self-center rounded-sm border border-dashed border-rule p-4 text-sm text-muted">No panels yet.</p>
      )}
    </li>
  );
}
