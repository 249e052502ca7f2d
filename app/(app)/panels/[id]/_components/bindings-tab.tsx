"use client";
import { useMutation, useQuery } from "@tanstack/react-query";
import Link from "next/link";
import { fetchJson, sendJson } from "@/components/api-client";
import { queryKeys, type RevisionView, type TraceView } from "@/components/figures/api";
import type { DatasetDetail } from "@/components/data/api";
import { Button } from "@/components/ui";
import { shortHash } from "@/lib/data/format";

type Input = TraceView["panels"][number]["inputs"][number];
type VersionInfo = Extract<Input, { kind: "version" }>["version"];

/** What each data name of the current revision points at; a newer version of a bound dataset is one click away. */
export function BindingsTab({
  figureId,
  panelId,
  revision,
  editable,
  onSaved,
}: {
  figureId: string;
  panelId: string;
  revision: RevisionView | null;
  editable: boolean;
  onSaved: (r: RevisionView) => void;
}) {
  const trace = useQuery({ queryKey: queryKeys.trace(figureId), queryFn: () => fetchJson<TraceView>(`/api/figures/${figureId}/trace`) });
  const rebind = useMutation({
    mutationFn: async ({ name, v }: { name: string; v: VersionInfo }) => {
      const d = await fetchJson<DatasetDetail>(`/api/datasets/${v.datasetId}`);
      const newest = d.versions[0];
      return sendJson<RevisionView>(`/api/panels/${panelId}/revisions`, "POST", {
        spec: revision!.spec,
        bindings: { ...revision!.bindings, [name]: { versionId: newest.id } },
        baseRevisionId: revision!.id,
        message: `Rebind “${name}” to ${v.dataset} version ${newest.number}`,
      });
    },
    onSuccess: onSaved,
  });
  if (!revision) return <p className="text-sm text-muted">No revision yet: generate a spec in the builder and save it; its data bindings appear here.</p>;
  const inputs = trace.data?.panels.find((p) => p.panelId === panelId)?.inputs ?? [];

  return (
    <div>
      <p className="mb-3 text-sm text-muted">
        Revision {revision.number} binds {Object.keys(revision.bindings).length} data name{Object.keys(revision.bindings).length === 1 ? "" : "s"}. Bindings
        point at immutable versions by content hash.
      </p>
      {trace.isLoading ? <p className="text-sm text-muted">loading…</p> : null}
      {trace.isError ? (
        <p role="alert" className="text-sm text-bad">
          ✕ {trace.error.message}
        </p>
      ) : null}
      <ul className="divide-y divide-rule rounded-sm border border-rule bg-sheet" aria-label="Bindings">
        {inputs.map((input) => (
          <li key={input.name} className="p-3 text-sm">
            <p>
              <code className="font-semibold">{input.name}</code> →{" "}
              {input.kind === "version" ? "dataset version" : `${input.analysis.model} fit (${input.output})`}
            </p>
            {input.kind === "version" ? (
              <VersionLine v={input.version} />
            ) : (
              <>
                <p className="mt-1 text-xs text-muted">
                  analysis {input.analysis.id.slice(0, 8)} · model version {input.analysis.modelVersion} · run {String(input.analysis.createdAt).slice(0, 10)}
                </p>
                <VersionLine v={input.input} prefix="fitted to" />
                <VersionLine v={input.derived} prefix="output" />
                {input.input.latestNumber > input.input.number ? (
                  <p className="mt-1 text-xs text-warn">
                    <span aria-hidden>△ </span>version {input.input.latestNumber} of {input.input.dataset} is newer —{" "}
                    <Link className="underline" href={`/datasets/${input.input.datasetId}`}>
                      fit it again
                    </Link>{" "}
                    and bind the new fit in the builder.
                  </p>
                ) : null}
              </>
            )}
            {input.kind === "version" && input.version.latestNumber > input.version.number ? (
              <div className="mt-2 flex flex-wrap items-center gap-2 rounded-sm border border-warn/40 bg-[#fbf4e6] px-2 py-1.5 text-xs text-warn">
                <span>
                  <span aria-hidden>△ </span>version {input.version.latestNumber} is newer
                </span>
                {editable ? (
                  <Button
                    variant="quiet"
                    className="!px-2 !py-0.5 text-xs"
                    disabled={rebind.isPending}
                    onClick={() => rebind.mutate({ name: input.name, v: input.version })}
                  >
                    rebind to version {input.version.latestNumber}
                  </Button>
                ) : null}
              </div>
            ) : null}
          </li>
        ))}
      </ul>
      {rebind.isError ? (
        <p role="alert" className="mt-2 text-sm text-bad">
          ✕ {rebind.error.message}
        </p>
      ) : null}
      {rebind.isSuccess ? (
        <p role="status" className="mt-2 text-sm text-good">
          ✓ Rebound: revision {rebind.data.number} saved.
        </p>
      ) : null}
    </div>
  );
}

function VersionLine({ v, prefix }: { v: VersionInfo; prefix?: string }) {
  return (
    <p className="mt-1 text-xs">
      {prefix ? <span className="text-muted">{prefix} </span> : null}
      <Link href={`/datasets/${v.datasetId}?v=${v.versionId}`} className="underline">
        {v.dataset}
      </Link>
      , version {v.number}
      {" · "}
      <code title={v.sha256}>sha256 {shortHash(v.sha256, 12)}</code> · {v.fileName}
    </p>
  );
}
