"use client";
import { Fragment } from "react";
import type { RevisionView } from "@/components/figures/api";
import { diffStats, lineDiff, type DiffLine } from "@/components/figures/line-diff";
import { PanelChartLazy } from "@/components/figures/panel-chart-lazy";
import { PX_PER_MM } from "@/components/figures/vega-render";
import { shortHash } from "@/lib/data/format";

const CONTEXT = 3;
const SIGN = { same: " ", added: "+", removed: "−" } as const;
const LOOK = { same: "", added: "bg-[#e6f4ea] text-[#14532d]", removed: "bg-[#fbeaea] text-[#7f1d1d]" } as const;

/** Hunks with a few lines of context; long unchanged runs fold into one line. */
function hunks(lines: DiffLine[]): Array<DiffLine | { fold: number }> {
  const keep = lines.map((l, i) => l.kind !== "same" || lines.slice(Math.max(0, i - CONTEXT), i + CONTEXT + 1).some((x) => x.kind !== "same"));
  const out: Array<DiffLine | { fold: number }> = [];
  let folded = 0;
  lines.forEach((l, i) => {
    if (keep[i]) {
      if (folded) out.push({ fold: folded });
      folded = 0;
      out.push(l);
    } else folded++;
  });
  if (folded) out.push({ fold: folded });
  return out;
}

/** Two revisions: the spec as a line diff of the canonical JSON, what the data points at, and both renders. */
export function RevisionCompare({ a, b, widthMm }: { a: RevisionView; b: RevisionView; widthMm: number }) {
  const lines = lineDiff(JSON.stringify(a.spec, null, 2), JSON.stringify(b.spec, null, 2));
  const stats = diffStats(lines);
  const names = [...new Set([...Object.keys(a.bound), ...Object.keys(b.bound)])].sort();
  // Side by side: wide panels are shown smaller here (the figure page shows print size).
  const zoom = Math.min(1, 350 / (widthMm * PX_PER_MM));
  const dataChanges = names.filter((n) => a.bound[n]?.sha256 !== b.bound[n]?.sha256 || a.bound[n]?.output !== b.bound[n]?.output);
  return (
    <div className="space-y-4">
      <div>
        <p className="mb-1 text-sm" data-testid="diff-summary">
          Spec, revision {a.number} → {b.number}:{" "}
          {stats.added || stats.removed ? (
            <>
              <span className="text-good">
                +{stats.added} line{stats.added === 1 ? "" : "s"}
              </span>
              , <span className="text-bad">−{stats.removed}</span>
            </>
          ) : (
            "no change"
          )}
          {" · "}data:{" "}
          {dataChanges.length
            ? dataChanges.map((n) => `“${n}” ${shortHash(a.bound[n]?.sha256, 8)} → ${shortHash(b.bound[n]?.sha256, 8)}`).join("; ")
            : "no change"}
        </p>
        <div
          className="max-h-96 overflow-auto rounded-sm border border-rule bg-white font-mono text-xs leading-5"
          role="table"
          aria-label={`Spec diff, revision ${a.number} to ${b.number}`}
          data-testid="spec-diff"
        >
          {hunks(lines).map((h, i) =>
            "fold" in h ? (
              <div key={i} role="row" className="bg-paper px-2 text-muted">
                ⋯ {h.fold} unchanged line{h.fold === 1 ? "" : "s"}
              </div>
            ) : (
              <Fragment key={i}>
                <div role="row" className={`flex whitespace-pre ${LOOK[h.kind]}`} data-kind={h.kind}>
                  <span className="w-9 shrink-0 select-none pr-1 text-right text-muted">{h.oldNo ?? ""}</span>
                  <span className="w-9 shrink-0 select-none pr-1 text-right text-muted">{h.newNo ?? ""}</span>
                  <span className="w-4 shrink-0 select-none text-center font-bold" aria-label={h.kind === "same" ? undefined : h.kind}>
                    {SIGN[h.kind]}
                  </span>
                  <span>{h.text}</span>
                </div>
              </Fragment>
            ),
          )}
        </div>
      </div>
      <div className="flex flex-wrap gap-4" data-testid="compare-renders">
        {[a, b].map((r) => (
          <div key={r.id} className="min-w-0">
            <p className="mb-1 text-xs font-semibold">
              Revision {r.number}{" "}
              <span className="font-normal text-muted">
                · {shortHash(r.contentHash, 8)}
                {zoom < 1 ? ` · shown at ${Math.round(zoom * 100)} %` : ""}
              </span>
            </p>
            <div className="rounded-sm border border-rule bg-white p-1">
              <PanelChartLazy spec={r.spec} revisionId={r.id} widthMm={widthMm} zoom={zoom} label={`Render of revision ${r.number}`} />
            </div>
          </div>
        ))}
      </div>
    </div>
  );
}
