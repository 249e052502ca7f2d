"use client";
import { useMutation, useQueryClient } from "@tanstack/react-query";
import { useState } from "react";
import { sendJson } from "@/components/api-client";
import { queryKeys, type PanelView } from "@/components/figures/api";
import { DataWarningList } from "@/components/figures/data-warnings";
import { Button } from "@/components/ui";
import { roleAllows } from "@/lib/authz/policy";

/**
 * Approve / needs revision on the current revision's content hash, for the roles the rules allow.
 * A revision with data warnings (fields the data lacks, no rows, rows left out) shows them here and
 * approving needs a ticked "I have read the data warning"; the server accepts approvals either way
 * and records the acknowledgement in the audit entry.
 */
export function DecisionBox({ panel, me }: { panel: PanelView; me: string }) {
  const qc = useQueryClient();
  const [asking, setAsking] = useState(false);
  const [note, setNote] = useState("");
  const [readWarningsOf, setReadWarningsOf] = useState<string | null>(null);
  const rev = panel.currentRevision;
  const warnings = panel.dataWarnings;
  const warningsRead = !warnings.length || (rev !== null && readWarningsOf === rev.id);
  const decide = useMutation({
    mutationFn: (v: { decision: "approved" | "needs_revision"; note?: string }) =>
      sendJson(`/api/panels/${panel.id}/approvals`, "POST", {
        revisionId: rev!.id,
        decision: v.decision,
        note: v.note,
        ...(warnings.length && warningsRead ? { acknowledgedWarnings: true } : {}),
      }),
    onSuccess: () => {
      setAsking(false);
      setNote("");
      return Promise.all([qc.invalidateQueries({ queryKey: queryKeys.panel(panel.id) }), qc.invalidateQueries({ queryKey: queryKeys.figure(panel.figureId) })]);
    },
  });
  if (!rev) return <p className="text-sm text-muted">Nothing to review yet: the panel has no revision.</p>;
  const reason = !roleAllows(panel.role, "review.decide")
    ? "Viewers follow along; reviewers, authors and the PI decide."
    : rev.createdBy === me
      ? "You made this revision; someone else must review it."
      : null;
  const mine = panel.decisions.filter((d) => d.userId === me && !d.stale).at(-1);
  return (
    <div>
      {mine ? (
        <p className="mb-2 text-xs text-muted">
          Your decision on revision {rev.number}: <b>{mine.decision === "approved" ? "✓ approved" : "✕ needs revision"}</b> — you can change it.
        </p>
      ) : null}
      {reason ? <p className="text-xs text-muted">{reason}</p> : null}
      {reason || !warnings.length ? null : (
        <div className="mb-2 space-y-1.5" data-testid="approve-warnings">
          <DataWarningList warnings={warnings} />
          <label className="flex items-start gap-2 text-sm">
            <input type="checkbox" className="mt-0.5" checked={warningsRead} onChange={(e) => setReadWarningsOf(e.target.checked ? rev.id : null)} />
            <span>I have read the data warning</span>
          </label>
        </div>
      )}
      {reason ? null : (
        <div className="flex flex-wrap gap-2">
          <Button
            type="button"
            disabled={decide.isPending || !warningsRead}
            onClick={() => decide.mutate({ decision: "approved" })}
            title={warningsRead ? undefined : "Tick “I have read the data warning” first"}
          >
            ✓ Approve revision {rev.number}
          </Button>
          <Button type="button" variant="danger" disabled={decide.isPending} onClick={() => setAsking((a) => !a)} aria-expanded={asking}>
            ✕ Needs revision
          </Button>
        </div>
      )}
      {asking ? (
        <form
          className="mt-2 space-y-2"
          onSubmit={(e) => {
            e.preventDefault();
            decide.mutate({ decision: "needs_revision", note });
          }}
        >
          <label className="block text-sm">
            <span className="mb-1 block font-medium">What needs to change</span>
            <textarea
              required
              className="w-full rounded-sm border border-rule bg-white px-2.5 py-1.5 text-sm"
              rows={3}
              value={note}
              onChange={(e) => setNote(e.target.value)}
            />
          </label>
          <Button type="submit" variant="danger" disabled={decide.isPending}>
            Send: needs revision
          </Button>
        </form>
      ) : null}
      {decide.isError ? (
        <p role="alert" className="mt-2 text-sm text-bad">
          <span aria-hidden>✕ </span>
          {decide.error.message}
        </p>
      ) : null}
    </div>
  );
}
