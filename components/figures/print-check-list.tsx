"use client";
import { useQuery } from "@tanstack/react-query";
import { useState } from "react";
import { fetchJson } from "@/components/api-client";
import type { PrintCheck } from "@/lib/figures/print-check";
import { KeepOlderVersion } from "./keep-older-version";

/** The figure's print check (GET /api/figures/{id}/print-check), refetched when the figure hash changes. */
function usePrintCheck(figureId: string, figureHash: string) {
  return useQuery({
    queryKey: ["print-check", figureId, figureHash],
    queryFn: () => fetchJson<PrintCheck>(`/api/figures/${figureId}/print-check`),
    staleTime: 60_000,
  });
}

/**
 * The print check as a checklist: each rule with ✓ or ✕ and, for a failure, the reason per panel.
 * `failuresOnly` (the sign-off box) lists the failing rules alone under a one-line summary.
 */
export function PrintCheckList({
  figureId,
  figureHash,
  failuresOnly = false,
  mayKeepOlder = false,
}: {
  figureId: string;
  figureHash: string;
  failuresOnly?: boolean;
  /** Offer to keep an older bound version on purpose (those who may edit the figure). */
  mayKeepOlder?: boolean;
}) {
  const check = usePrintCheck(figureId, figureHash);
  const [kept, setKept] = useState<string | null>(null);
  if (check.isLoading) return <p className="text-xs text-muted">Print check: drawing the figure…</p>;
  if (check.isError) return <p className="text-xs text-bad">Print check: {check.error.message}</p>;
  const items = check.data?.items ?? [];
  const failing = items.filter((i) => !i.ok);
  const shown = failuresOnly ? failing : items;
  return (
    <div className="text-xs" data-testid={`print-check-${figureId}`}>
      <p className={failing.length ? "font-medium text-warn" : "text-good"}>
        {failing.length
          ? `Print check: ${failing.length} of ${items.length} rules fail${failuresOnly ? "; signing off asks for a reason" : ""}`
          : `Print check: all ${items.length} rules pass`}
      </p>
      {shown.length ? (
        <ul className="mt-1 space-y-1" aria-label="Print check">
          {shown.map((i) => (
            <li key={i.id} className="flex gap-1.5">
              <span aria-hidden className={`w-3 shrink-0 text-center font-bold ${i.ok ? "text-good" : "text-bad"}`}>
                {i.ok ? "✓" : "✕"}
              </span>
              <div>
                <span className="sr-only">{i.ok ? "passes: " : "fails: "}</span>
                {i.label}
                {i.ok && i.detail ? <span className="text-muted"> — {i.detail}</span> : null}
                {!i.ok ? (
                  <ul className="ml-3 list-disc text-ink">
                    {i.problems.map((p) => (
                      <li key={p}>{p}</li>
                    ))}
                  </ul>
                ) : null}
                {!i.ok && mayKeepOlder
                  ? i.keep?.map((k) => <KeepOlderVersion key={`${k.panelId}|${k.dataset}|${k.number}`} older={k} onKept={setKept} />)
                  : null}
              </div>
            </li>
          ))}
        </ul>
      ) : null}
      {kept ? (
        <p role="status" className="mt-1 text-good">
          {kept}
        </p>
      ) : null}
    </div>
  );
}
