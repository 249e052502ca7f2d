"use client";
import { useQuery } from "@tanstack/react-query";
import Link from "next/link";
import { fetchJson } from "@/components/api-client";
import { queryKeys, type TraceView } from "@/components/figures/api";
import { shortHash } from "@/lib/data/format";

/** The provenance chain in a table: panel → revision hash → data name → version + sha256 → analysis model. */
export function TraceTable({ figureId, open, onToggle }: { figureId: string; open: boolean; onToggle: (open: boolean) => void }) {
  const trace = useQuery({ queryKey: queryKeys.trace(figureId), queryFn: () => fetchJson<TraceView>(`/api/figures/${figureId}/trace`), enabled: open });
  return (
    <details id="trace" open={open} onToggle={(e) => onToggle(e.currentTarget.open)} className="rounded-sm border border-rule bg-sheet p-4 text-sm">
      <summary className="cursor-pointer font-semibold">Trace: where every panel comes from</summary>
      <p className="mt-1 text-xs text-muted">
        <a href={`/api/figures/${figureId}/trace`} className="underline">
          trace as JSON
        </a>
      </p>
      {trace.isLoading ? <p className="mt-2 text-xs text-muted">loading…</p> : null}
      {trace.isError ? (
        <p role="alert" className="mt-2 text-bad">
          ✕ {trace.error.message}
        </p>
      ) : null}
      {trace.data ? (
        <div className="relative mt-2 overflow-x-auto">
          <p className="mb-1 text-xs text-muted">
            figure hash <code title={trace.data.figure.figureHash}>{shortHash(trace.data.figure.figureHash, 16)}</code>
          </p>
          <table className="w-full text-left text-xs" aria-label="Trace">
            <thead className="text-muted">
              <tr>
                <th className="py-1 pr-2">Panel</th>
                <th className="pr-2">Revision</th>
                <th className="pr-2">Data</th>
                <th>Source</th>
              </tr>
            </thead>
            <tbody className="align-top">
              {trace.data.panels.flatMap((p) => {
                const rev = p.revision;
                if (!rev || p.inputs.length === 0) {
                  return [
                    <tr key={p.panelId} className="border-t border-rule">
                      <td className="py-1 pr-2 font-bold">{p.letter}</td>
                      <td className="pr-2">{rev ? <RevCell rev={rev} /> : "none"}</td>
                      <td colSpan={2} className="text-muted">
                        no bound data
                      </td>
                    </tr>,
                  ];
                }
                return p.inputs.map((input, i) => (
                  <tr key={`${p.panelId}-${input.name}`} className={i === 0 ? "border-t border-rule" : ""}>
                    <td className="py-1 pr-2 font-bold">
                      {i === 0 ? (
                        <Link href={`/panels/${p.panelId}`} className="underline">
                          {p.letter}
                        </Link>
                      ) : (
                        ""
                      )}
                    </td>
                    <td className="pr-2">{i === 0 ? <RevCell rev={rev} /> : ""}</td>
                    <td className="pr-2 font-mono">{input.name}</td>
                    <td className="py-1">
                      {input.kind === "version" ? (
                        <VersionCell v={input.version} />
                      ) : (
                        <>
                          <span>
                            {input.analysis.model} fit (model {input.analysis.modelVersion}), {input.output}
                          </span>
                          <span className="block text-muted">
                            of <VersionCell v={input.input} />
                          </span>
                          <span className="block text-muted">
                            output <VersionCell v={input.derived} />
                          </span>
                        </>
                      )}
                    </td>
                  </tr>
                ));
              })}
            </tbody>
          </table>
        </div>
      ) : null}
    </details>
  );
}

function RevCell({ rev }: { rev: { number: number; contentHash: string } }) {
  return (
    <span>
      rev {rev.number} · <code title={rev.contentHash}>{shortHash(rev.contentHash, 8)}</code>
    </span>
  );
}

function VersionCell({ v }: { v: { datasetId: string; dataset: string; number: number; latestNumber: number; sha256: string; versionId: string } }) {
  return (
    <span>
      <Link href={`/datasets/${v.datasetId}?v=${v.versionId}`} className="underline">
        {v.dataset}
      </Link>{" "}
      v{v.number}
      {" · "}
      <code title={v.sha256}>sha256 {shortHash(v.sha256, 8)}</code>
      {v.latestNumber > v.number ? <span className="text-warn"> (v{v.latestNumber} is newer)</span> : null}
    </span>
  );
}
