"use client";
import { useQuery } from "@tanstack/react-query";
import Link from "next/link";
import { fetchJson } from "@/components/api-client";
import { queryKeys, type TraceView } from "@/components/figures/api";
import { formatBytes, formatDate, shortHash } from "@/lib/data/format";

/**
 * The provenance chain in a table: panel → revision hash → data name → version + sha256 → analysis model;
 * then the review (decisions on each revision, sign-offs and their withdrawal) and the files exported so far.
 */
export function TraceTable({ figureId, open, onToggle }: { figureId: string; open: boolean; onToggle: (open: boolean) => void }) {
  const trace = useQuery({ queryKey: queryKeys.trace(figureId), queryFn: () => fetchJson<TraceView>(`/api/figures/${figureId}/trace`), enabled: open });
  return (
    <details id="trace" open={open} onToggle={(e) => onToggle(e.currentTarget.open)} className="rounded-sm border border-rule bg-sheet p-4 text-sm">
      <summary className="cursor-pointer font-semibold">Trace: where every panel comes from</summary>
      <p className="mt-1 text-xs text-muted">
        <a href={`/api/figures/${figureId}/trace`} className="underline">
          trace as JSON
        </a>
        {" · "}
        <a href={`/api/figures/${figureId}/trace?format=prov`} className="underline">
          as W3C PROV-JSON
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
          <ReviewTrail trace={trace.data} />
          <ExportTrail trace={trace.data} />
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

/** Decisions on the panels' revisions and the figure's sign-offs, oldest first, in words. */
function ReviewTrail({ trace }: { trace: TraceView }) {
  const events = [
    ...trace.decisions.map((d) => ({
      key: `d-${d.id}`,
      at: d.createdAt,
      text: (
        <>
          <strong>{d.by.name}</strong> {d.decision === "approved" ? "approved" : "asked for a revision of"} panel {d.panelLetter}, revision{" "}
          {d.revisionNumber ?? "?"} (<code title={d.contentHash}>{shortHash(d.contentHash, 8)}</code>)
          {d.stale ? <span className="text-warn"> — stale: the panel has changed since</span> : null}
          {d.note ? <span className="block text-muted">“{d.note}”</span> : null}
        </>
      ),
    })),
    ...trace.signoffs.flatMap((s) => [
      {
        key: `s-${s.id}`,
        at: s.createdAt,
        text: (
          <>
            <strong>{s.by.name}</strong> signed off the figure at hash <code title={s.figureHash}>{shortHash(s.figureHash, 8)}</code>
            {s.withdrawn ? (
              <span className="text-muted"> (withdrawn)</span>
            ) : s.stale ? (
              <span className="text-warn"> — stale: the figure has changed since</span>
            ) : null}
            {s.reason ? <span className="block text-muted">“{s.reason}”</span> : null}
            {s.printCheck.length ? <span className="block text-warn">Signed over the print check: {s.printCheck.join("; ")}</span> : null}
          </>
        ),
      },
      ...(s.withdrawn
        ? [
            {
              key: `w-${s.id}`,
              at: s.withdrawn.at,
              text: (
                <>
                  <strong>{s.withdrawn.by.name}</strong> withdrew that sign-off
                  {s.withdrawn.reason ? <span className="block text-muted">“{s.withdrawn.reason}”</span> : null}
                </>
              ),
            },
          ]
        : []),
    ]),
  ].sort((a, b) => new Date(a.at).getTime() - new Date(b.at).getTime());
  return (
    <section aria-label="Review decisions and sign-offs" className="mt-4">
      <h3 className="text-xs font-semibold">Review</h3>
      {events.length === 0 ? (
        <p className="text-xs text-muted">No decisions or sign-offs yet.</p>
      ) : (
        <ol className="mt-1 space-y-1 text-xs">
          {events.map((e) => (
            <li key={e.key}>
              <span className="text-muted">{formatDate(e.at)}</span> · {e.text}
            </li>
          ))}
        </ol>
      )}
    </section>
  );
}

/** Every file exported from the figure: when, by whom, which format, at which figure hash, marked as a draft or not. */
function ExportTrail({ trace }: { trace: TraceView }) {
  return (
    <section className="mt-4">
      <h3 className="text-xs font-semibold">Exports</h3>
      {trace.exports.length === 0 ? (
        <p className="text-xs text-muted">Nothing exported yet.</p>
      ) : (
        <table className="mt-1 w-full text-left text-xs" aria-label="Exports">
          <thead className="text-muted">
            <tr>
              <th className="py-1 pr-2">When</th>
              <th className="pr-2">Who</th>
              <th className="pr-2">File</th>
              <th className="pr-2">Figure hash</th>
              <th>Status</th>
            </tr>
          </thead>
          <tbody>
            {[...trace.exports].reverse().map((e) => (
              <tr key={e.seq} className="border-t border-rule">
                <td className="py-1 pr-2">{formatDate(e.at)}</td>
                <td className="pr-2">{e.by.name}</td>
                <td className="pr-2">
                  {e.format}
                  {e.dpi ? ` ${e.dpi} dpi` : ""}
                  {e.colour === "grey" ? " grey" : ""} · {formatBytes(e.bytes)}
                </td>
                <td className="pr-2">
                  <code title={e.figureHash}>{shortHash(e.figureHash, 8)}</code>
                  {e.figureHash === trace.figure.figureHash ? "" : <span className="text-muted"> (earlier)</span>}
                </td>
                <td>{e.signedOff ? "✓ signed off" : e.draftMark ? "◇ draft, marked" : "◇ draft, mark left out"}</td>
              </tr>
            ))}
          </tbody>
        </table>
      )}
    </section>
  );
}
