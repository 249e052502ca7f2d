"use client";
import { useQueryClient } from "@tanstack/react-query";
import { useState } from "react";
import { fetchJson, sendJson } from "@/components/api-client";
import { Button, TextInput } from "@/components/ui";
import type { OlderVersion } from "@/lib/figures/print-check";

interface CurrentRevision {
  id: string;
  number: number;
  spec: unknown;
  bindings: unknown;
  message: string;
}

/**
 * Keep an older dataset version on purpose: asks why, then saves the panel's current content again
 * as a new revision whose note says “keep version N: why”. The content hash does not change, so
 * reviews and approvals stand; the reason is in the revision history and the trace.
 */
export function KeepOlderVersion({ older, onKept }: { older: OlderVersion; onKept: (text: string) => void }) {
  const queryClient = useQueryClient();
  const [open, setOpen] = useState(false);
  const [reason, setReason] = useState("");
  const [busy, setBusy] = useState(false);
  const [problem, setProblem] = useState<string | null>(null);
  const what = `version ${older.number} of “${older.dataset}” in panel ${older.panel}`;

  async function keep() {
    if (!reason.trim()) return setProblem("Say why this version is kept: the reason is what a reader of the trace will see.");
    setBusy(true);
    setProblem(null);
    try {
      const panel = await fetchJson<{ currentRevision: CurrentRevision | null }>(`/api/panels/${older.panelId}`);
      const current = panel.currentRevision;
      if (!current) throw new Error(`Panel ${older.panel} has no revision to keep.`);
      // Other versions this panel already keeps stay kept: their words follow the new one.
      const earlier = /\bkeep/i.test(current.message) ? `; ${current.message}` : "";
      const saved = await sendJson<{ number: number }>(`/api/panels/${older.panelId}/revisions`, "POST", {
        spec: current.spec,
        bindings: current.bindings,
        baseRevisionId: current.id,
        message: `keep version ${older.number}: ${reason.trim()}${earlier}`,
      });
      // The check passes now and this control goes away: the list above it says what happened.
      onKept(`Kept: revision ${saved.number} of panel ${older.panel} records why; its content is unchanged, so reviews stand.`);
      await queryClient.invalidateQueries();
    } catch (err) {
      setProblem((err as Error).message);
    } finally {
      setBusy(false);
    }
  }

  return (
    <div className="mt-1">
      {open ? (
        <div className="flex flex-wrap items-end gap-2 rounded-sm border border-rule bg-paper p-2">
          <label className="min-w-64 flex-1">
            <span className="mb-1 block font-medium">Why keep {what}?</span>
            <TextInput value={reason} onChange={(e) => setReason(e.target.value)} placeholder="e.g. version 2 is dark-subtracted and hides the NV⁰ line" />
          </label>
          <Button type="button" onClick={() => void keep()} disabled={busy}>
            {busy ? "Saving…" : "Keep it"}
          </Button>
          <Button type="button" variant="quiet" onClick={() => setOpen(false)} disabled={busy}>
            Cancel
          </Button>
        </div>
      ) : (
        <Button type="button" variant="quiet" onClick={() => setOpen(true)}>
          Keep version {older.number} of “{older.dataset}” in panel {older.panel} on purpose…
        </Button>
      )}
      {problem ? (
        <p role="alert" className="mt-1 text-bad">
          {problem}
        </p>
      ) : null}
    </div>
  );
}
