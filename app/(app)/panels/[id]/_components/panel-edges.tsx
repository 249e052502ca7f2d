"use client";
import { useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import { useRouter } from "next/navigation";
import type { ReactNode } from "react";
import { fetchJson, sendJson } from "@/components/api-client";
import { ArchivedBanner, ArchiveToggleButton } from "@/components/archive/archive-controls";
import { queryKeys, type PanelView } from "@/components/figures/api";
import { Button, Notice } from "@/components/ui";
import { roleAllows } from "@/lib/authz/policy";
import { SignedOffContext } from "./signed-off-warning";

/**
 * Around the panel workspace: the archived banner (Restore, and for the PI deletion for good), the
 * draft's "Send to review", and whether saving would make the figure's sign-off stale.
 */
export function PanelEdges({ initial, children }: { initial: PanelView; children: ReactNode }) {
  const qc = useQueryClient();
  const router = useRouter();
  const { data: panel = initial } = useQuery({
    queryKey: queryKeys.panel(initial.id),
    queryFn: () => fetchJson<PanelView>(`/api/panels/${initial.id}`),
    initialData: initial,
  });
  const refresh = () => {
    void qc.invalidateQueries({ queryKey: queryKeys.panel(panel.id) });
    void qc.invalidateQueries({ queryKey: queryKeys.figure(panel.figureId) });
    router.refresh();
  };
  const send = useMutation({ mutationFn: () => sendJson(`/api/panels/${panel.id}/send-to-review`, "POST"), onSuccess: refresh });
  const editable = roleAllows(panel.role, "figure.edit");
  const draft = !panel.inReview && !panel.archivedAt;
  return (
    <SignedOffContext.Provider value={{ signedOff: panel.figure.state === "signed_off", figureNumber: panel.figure.number }}>
      {panel.archivedAt ? (
        <ArchivedBanner
          kind="panel"
          id={panel.id}
          archivedAt={panel.archivedAt}
          canRestore={roleAllows(panel.role, "archive.manage")}
          canDelete={roleAllows(panel.role, "archive.delete")}
          onChanged={(deleted) => (deleted ? router.push(`/figures/${panel.figureId}`) : refresh())}
        />
      ) : null}
      {!panel.archivedAt && roleAllows(panel.role, "archive.manage") ? (
        <p className="mb-2 flex justify-end">
          <ArchiveToggleButton kind="panel" id={panel.id} archived={false} onDone={refresh} />
        </p>
      ) : null}
      {draft ? (
        <section aria-label="Draft" className="mb-4 rounded-sm border border-dashed border-rule bg-sheet p-3 text-sm">
          <p className="font-semibold">
            <span aria-hidden>○ </span>Draft — reviewers are not asked yet
          </p>
          <p className="mt-1 text-xs text-muted">
            Anyone may comment on a draft; approvals and requests for a revision wait until it is in review.
            {panel.currentRevision ? "" : " Save a first revision, then send it to review."}
          </p>
          {editable && panel.currentRevision ? (
            <Button type="button" className="mt-2" disabled={send.isPending} onClick={() => send.mutate()}>
              {send.isPending ? "Sending…" : "Send to review"}
            </Button>
          ) : null}
          {send.error ? <Notice ok={false}>{send.error.message}</Notice> : null}
        </section>
      ) : null}
      {send.isSuccess ? <Notice ok>Sent to review: the reviewers are asked.</Notice> : null}
      {children}
    </SignedOffContext.Provider>
  );
}
