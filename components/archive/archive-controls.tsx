"use client";
import { useMutation } from "@tanstack/react-query";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { ApiError, sendJson } from "@/components/api-client";
import { Button, Notice } from "@/components/ui";
import { formatDate } from "@/lib/data/format";

export type ArchiveKind = "dataset" | "analysis" | "panel" | "figure";
const PATHS: Record<ArchiveKind, string> = { dataset: "datasets", analysis: "analyses", panel: "panels", figure: "figures" };
const NAMES: Record<ArchiveKind, string> = { dataset: "dataset", analysis: "stored run", panel: "panel", figure: "figure" };

/** Archive (true) or restore (false) through the API. */
function setArchived(kind: ArchiveKind, id: string, archived: boolean) {
  return sendJson<{ archivedAt: string | null }>(`/api/${PATHS[kind]}/${id}/archive`, "POST", { archived });
}

/** The "Show archived" switch of a list. */
export function ShowArchivedToggle({ checked, onChange }: { checked: boolean; onChange: (v: boolean) => void }) {
  return (
    <label className="inline-flex items-center gap-2 text-sm">
      <input type="checkbox" checked={checked} onChange={(e) => onChange(e.target.checked)} />
      Show archived
    </label>
  );
}

/**
 * The banner of an archived thing opened by a direct link (from a trace, a bundle, a decision, a
 * revision): it is kept whole; Restore puts it back in lists; the PI may delete it for good when
 * nothing references it (the refusal says what does).
 */
export function ArchivedBanner({
  kind,
  id,
  archivedAt,
  canRestore,
  canDelete,
  onChanged,
}: {
  kind: ArchiveKind;
  id: string;
  archivedAt: string | Date;
  canRestore: boolean;
  canDelete: boolean;
  onChanged: (deleted: boolean) => void;
}) {
  const [confirming, setConfirming] = useState(false);
  const restore = useMutation({ mutationFn: () => setArchived(kind, id, false), onSuccess: () => onChanged(false) });
  const remove = useMutation({ mutationFn: () => sendJson(`/api/${PATHS[kind]}/${id}`, "DELETE"), onSuccess: () => onChanged(true) });
  const refs = remove.error instanceof ApiError ? ((remove.error.details as { references?: string[] } | undefined)?.references ?? null) : null;
  return (
    <section role="status" aria-label="Archived" className="mb-4 rounded-sm border border-dashed border-warn bg-[#fbf4e6] p-3 text-sm">
      <p className="font-semibold">
        <span aria-hidden>▣ </span>Archived on {formatDate(archivedAt)}
      </p>
      <p className="mt-1 text-xs text-muted">
        This {NAMES[kind]} is hidden from lists and pickers; every trace, bundle, decision and revision that names it still opens it.
      </p>
      <div className="mt-2 flex flex-wrap gap-2">
        {canRestore ? (
          <Button type="button" variant="quiet" disabled={restore.isPending} onClick={() => restore.mutate()}>
            {restore.isPending ? "Restoring…" : "Restore"}
          </Button>
        ) : null}
        {canDelete && !confirming ? (
          <Button type="button" variant="danger" onClick={() => setConfirming(true)}>
            Delete for good…
          </Button>
        ) : null}
        {confirming ? (
          <>
            <Button type="button" variant="danger" disabled={remove.isPending} onClick={() => remove.mutate()}>
              {remove.isPending ? "Deleting…" : `Delete this ${NAMES[kind]} for good`}
            </Button>
            <Button type="button" variant="quiet" onClick={() => setConfirming(false)}>
              Keep it
            </Button>
          </>
        ) : null}
      </div>
      {restore.error ? <Notice ok={false}>{restore.error.message}</Notice> : null}
      {remove.error ? (
        <div role="alert" className="mt-2 text-sm text-bad">
          <p>
            <span aria-hidden>✕ </span>
            {remove.error.message}
          </p>
          {refs?.length ? (
            <ul className="ml-5 list-disc text-ink">
              {refs.map((r) => (
                <li key={r}>{r}</li>
              ))}
            </ul>
          ) : null}
        </div>
      ) : null}
    </section>
  );
}

/** The archived banner on a page drawn by the server: refreshes it after a restore, leaves for `afterDelete` after a deletion. */
export function ArchivedPageBanner(props: Omit<Parameters<typeof ArchivedBanner>[0], "onChanged"> & { afterDelete: string }) {
  const router = useRouter();
  const { afterDelete, ...rest } = props;
  return <ArchivedBanner {...rest} onChanged={(deleted) => (deleted ? router.push(afterDelete) : router.refresh())} />;
}

/** Archive or Restore beside an item, by its state; `onDone` refreshes the list. */
export function ArchiveToggleButton({ kind, id, archived, onDone }: { kind: ArchiveKind; id: string; archived: boolean; onDone: () => void }) {
  const m = useMutation({ mutationFn: () => setArchived(kind, id, !archived), onSuccess: onDone });
  return (
    <span className="inline-flex flex-col">
      <Button type="button" variant="quiet" className="px-2 py-0.5 text-xs" disabled={m.isPending} onClick={() => m.mutate()}>
        {archived ? (m.isPending ? "Restoring…" : "Restore") : m.isPending ? "Archiving…" : "Archive"}
      </Button>
      {m.error ? <Notice ok={false}>{m.error.message}</Notice> : null}
    </span>
  );
}

/** "Archive" on a thing's own page: it stays there, under the archived banner. */
export function ArchivePageButton({ kind, id }: { kind: ArchiveKind; id: string }) {
  const router = useRouter();
  return <ArchiveToggleButton kind={kind} id={id} archived={false} onDone={() => router.refresh()} />;
}
