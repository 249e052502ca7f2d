"use client";
import { useQuery } from "@tanstack/react-query";
import { useState } from "react";
import { fetchJson } from "@/components/api-client";
import { queryKeys, type RevisionListItem, type RevisionView } from "@/components/figures/api";
import { Select } from "@/components/ui";
import { shortHash } from "@/lib/data/format";
import { RevisionCompare } from "./revision-compare";
import { RelativeTime } from "@/components/review/relative-time";

/** The chain of revisions, newest first; any two compared: the changes in words, the JSON side by side on request, and two renders. */
export function RevisionsTab({ panelId, widthMm }: { panelId: string; widthMm: number }) {
  const list = useQuery({
    queryKey: queryKeys.revisions(panelId),
    queryFn: async () => (await fetchJson<{ items: RevisionListItem[] }>(`/api/panels/${panelId}/revisions`)).items,
  });
  const items = list.data ?? [];
  const [a, setA] = useState<string>("");
  const [b, setB] = useState<string>("");
  const older = a || items[1]?.id || "";
  const newer = b || items[0]?.id || "";
  const left = useRevision(older);
  const right = useRevision(newer);

  if (list.isLoading) return <p className="text-sm text-muted">loading…</p>;
  if (!items.length) return <p className="text-sm text-muted">No revisions yet.</p>;
  return (
    <div className="space-y-5">
      <div className="relative overflow-x-auto">
        <table className="w-full text-left text-sm" aria-label="Revisions">
          <thead className="text-xs text-muted">
            <tr>
              <th className="py-1">#</th>
              <th>Revision note</th>
              <th>Author</th>
              <th>When</th>
              <th>Content hash</th>
            </tr>
          </thead>
          <tbody>
            {items.map((r) => (
              <tr key={r.id} className="border-t border-rule align-top">
                <td className="py-1.5 pr-2 font-semibold tabular">{r.number}</td>
                <td className="pr-2">{r.message || <span className="text-muted">(no note)</span>}</td>
                <td className="pr-2">{r.createdByName}</td>
                <td className="pr-2 whitespace-nowrap" title={String(r.createdAt)}>
                  <RelativeTime at={r.createdAt} />
                </td>
                <td>
                  <code title={r.contentHash}>{shortHash(r.contentHash)}</code>
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>
      {items.length < 2 ? (
        <p className="text-sm text-muted">Save a second revision to compare two.</p>
      ) : (
        <section aria-label="Compare revisions">
          <div className="mb-3 flex flex-wrap items-end gap-3">
            <h3 className="text-sm font-semibold">Compare</h3>
            <RevisionPicker word="from" items={items} value={older} onChange={setA} />
            <RevisionPicker word="to" items={items} value={newer} onChange={setB} />
          </div>
          {left.data && right.data ? <RevisionCompare a={left.data} b={right.data} widthMm={widthMm} /> : <p className="text-sm text-muted">loading…</p>}
        </section>
      )}
    </div>
  );
}

function useRevision(id: string) {
  return useQuery({
    queryKey: queryKeys.revision(id),
    queryFn: () => fetchJson<RevisionView>(`/api/revisions/${id}`),
    enabled: Boolean(id),
    staleTime: Infinity,
  });
}

function RevisionPicker({
  word,
  items,
  value,
  onChange,
}: {
  word: string;
  items: Array<{ id: string; number: number }>;
  value: string;
  onChange: (id: string) => void;
}) {
  return (
    <label className="text-sm">
      {word}{" "}
      <span className="inline-block w-36">
        <Select aria-label={`Compare ${word}`} value={value} onChange={(e) => onChange(e.target.value)}>
          {items.map((r) => (
            <option key={r.id} value={r.id}>
              revision {r.number}
            </option>
          ))}
        </Select>
      </span>
    </label>
  );
}
