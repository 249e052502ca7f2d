"use client";
import { useQueries } from "@tanstack/react-query";
import { useId, useMemo, useState } from "react";
import { fetchJson } from "@/components/api-client";
import type { VersionView } from "@/components/data/api";
import type { RevisionView } from "@/components/figures/api";
import { lineDiff, type DiffLine } from "@/components/figures/line-diff";
import { PanelChartLazy } from "@/components/figures/panel-chart-lazy";
import { PX_PER_MM } from "@/components/figures/vega-render";
import { Button } from "@/components/ui";
import { shortHash } from "@/lib/data/format";
import { describeSpecChange, type SpecChangeKind, type VersionLabel } from "@/lib/figures/describe-spec-change";

const CONTEXT = 3;
/** Each change carries a shape as well as its words; nothing rests on colour. */
const MARK: Record<SpecChangeKind, string> = { added: "+", removed: "−", changed: "~" };

/** One row of the side-by-side view: a line of the older spec, of the newer, or both. */
interface Row {
  left?: DiffLine;
  right?: DiffLine;
}

/** Unchanged lines on both sides; a run of removed lines beside the added lines that replaced it. */
function sideBySide(lines: DiffLine[]): Row[] {
  const rows: Row[] = [];
  for (let i = 0; i < lines.length;) {
    if (lines[i].kind === "same") {
      rows.push({ left: lines[i], right: lines[i] });
      i++;
      continue;
    }
    const removed: DiffLine[] = [];
    const added: DiffLine[] = [];
    while (i < lines.length && lines[i].kind !== "same") (lines[i].kind === "removed" ? removed : added).push(lines[i++]);
    for (let k = 0; k < Math.max(removed.length, added.length); k++) rows.push({ left: removed[k], right: added[k] });
  }
  return rows;
}

const isSame = (r: Row) => r.left?.kind === "same";

/** Rows with a few lines of context around each change; long unchanged runs fold into one row. */
function withFolds(rows: Row[]): Array<Row | { fold: number }> {
  const keep = rows.map((r, i) => !isSame(r) || rows.slice(Math.max(0, i - CONTEXT), i + CONTEXT + 1).some((x) => !isSame(x)));
  const out: Array<Row | { fold: number }> = [];
  let folded = 0;
  rows.forEach((r, i) => {
    if (keep[i]) {
      if (folded) out.push({ fold: folded });
      folded = 0;
      out.push(r);
    } else folded++;
  });
  if (folded) out.push({ fold: folded });
  return out;
}

function JsonCell({ line, side }: { line?: DiffLine; side: "left" | "right" }) {
  if (!line) return <div role="cell" className="min-w-0 bg-paper/70" />;
  const changed = line.kind !== "same";
  const no = side === "left" ? line.oldNo : line.newNo;
  return (
    <div role="cell" className={`flex min-w-0 ${changed ? "bg-accent-soft" : ""}`} data-kind={line.kind}>
      <span className="w-8 shrink-0 pr-1 text-right text-muted select-none">{no ?? ""}</span>
      <span aria-hidden className="w-4 shrink-0 text-center font-bold select-none">
        {line.kind === "removed" ? MARK.removed : line.kind === "added" ? MARK.added : ""}
      </span>
      {changed ? <span className="sr-only">{line.kind}: </span> : null}
      <span className="min-w-0 break-all whitespace-pre-wrap">{line.text}</span>
    </div>
  );
}

function JsonSideBySide({ a, b, id }: { a: RevisionView; b: RevisionView; id: string }) {
  const rows = useMemo(() => withFolds(sideBySide(lineDiff(JSON.stringify(a.spec, null, 2), JSON.stringify(b.spec, null, 2)))), [a.spec, b.spec]);
  return (
    <div
      id={id}
      className="max-h-96 overflow-auto rounded-sm border border-rule bg-white font-mono text-xs leading-5"
      role="table"
      aria-label={`Spec JSON, revision ${a.number} beside revision ${b.number}`}
      data-testid="spec-diff"
    >
      <div role="row" className="sticky top-0 grid grid-cols-2 border-b border-rule bg-sheet font-sans font-semibold">
        <span role="columnheader" className="px-2 py-1">
          Revision {a.number}
        </span>
        <span role="columnheader" className="border-l border-rule px-2 py-1">
          Revision {b.number}
        </span>
      </div>
      {rows.map((r, i) =>
        "fold" in r ? (
          <div key={i} role="row" className="bg-paper px-2 text-muted">
            <span role="cell">
              ⋯ {r.fold} unchanged line{r.fold === 1 ? "" : "s"}
            </span>
          </div>
        ) : (
          <div key={i} role="row" className="grid grid-cols-2 [&>*+*]:border-l [&>*+*]:border-rule">
            <JsonCell line={r.left} side="left" />
            <JsonCell line={r.right} side="right" />
          </div>
        ),
      )}
    </div>
  );
}

/** Kept at module level so its result stays the same object until a version arrives. */
function versionLabels(results: Array<{ data?: VersionView }>): Record<string, VersionLabel> {
  const out: Record<string, VersionLabel> = {};
  for (const q of results) if (q.data) out[q.data.id] = { datasetId: q.data.datasetId, number: q.data.number };
  return out;
}

/** Numbers and datasets of the versions bound in either revision, for "version 1 → 2"; until known, files are named by hash. */
function useVersionLabels(a: RevisionView, b: RevisionView): Record<string, VersionLabel> {
  const ids = [...new Set([...Object.values(a.bound), ...Object.values(b.bound)].filter((s) => s.kind === "version").map((s) => s.versionId))].sort();
  return useQueries({
    queries: ids.map((id) => ({ queryKey: ["version", id], queryFn: () => fetchJson<VersionView>(`/api/versions/${id}`), staleTime: Infinity })),
    combine: versionLabels,
  });
}

const count = (n: number, what: string) => `${n} ${what}${n === 1 ? "" : "s"}`;

/** Two revisions: what changed in words (spec and data), the JSON side by side on request, and both renders. */
export function RevisionCompare({ a, b, widthMm }: { a: RevisionView; b: RevisionView; widthMm: number }) {
  const [showJson, setShowJson] = useState(false);
  const jsonId = useId();
  const versions = useVersionLabels(a, b);
  const changes = useMemo(() => describeSpecChange({ spec: a.spec, bound: a.bound }, { spec: b.spec, bound: b.bound }, versions), [a, b, versions]);
  const inData = changes.filter((c) => c.area === "data").length;
  const inSpec = changes.length - inData;
  // Side by side: wide panels are shown smaller here (the figure page shows print size).
  const zoom = Math.min(1, 350 / (widthMm * PX_PER_MM));
  return (
    <div className="space-y-4">
      <div>
        <p className="mb-1 text-sm" data-testid="diff-summary">
          What changed, revision {a.number} → {b.number}:{" "}
          {changes.length
            ? `${inSpec ? count(inSpec, "change") + " in the spec" : "the spec unchanged"}, ${inData ? count(inData, "change") + " in the data" : "the data unchanged"}`
            : "nothing — the same spec and the same data"}
        </p>
        {changes.length ? (
          <ul
            className="divide-y divide-rule/70 rounded-sm border border-rule bg-sheet text-sm"
            aria-label={`Changes from revision ${a.number} to ${b.number}`}
            data-testid="spec-changes"
          >
            {changes.map((c, i) => (
              <li key={i} className="flex gap-2 px-3 py-1.5" data-kind={c.kind} title={c.path}>
                <span aria-hidden className="w-4 shrink-0 text-center font-mono font-bold text-muted">
                  {MARK[c.kind]}
                </span>
                <span className="min-w-0 break-words">{c.text}</span>
              </li>
            ))}
          </ul>
        ) : null}
        <div className="mt-2">
          <Button type="button" variant="quiet" aria-expanded={showJson} aria-controls={showJson ? jsonId : undefined} onClick={() => setShowJson((s) => !s)}>
            <span aria-hidden>{showJson ? "▾" : "▸"}</span>
            {showJson ? "Hide the JSON" : "Show the JSON side by side"}
          </Button>
        </div>
        {showJson ? (
          <div className="mt-2">
            <JsonSideBySide a={a} b={b} id={jsonId} />
          </div>
        ) : null}
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
