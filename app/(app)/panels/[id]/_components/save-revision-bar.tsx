"use client";
import type { ReactNode } from "react";
import { ApiError } from "@/components/api-client";
import { Button, Field, TextInput } from "@/components/ui";
import { useSignedOffGuard } from "./signed-off-warning";

/**
 * The revision note and the save button under the builder and the spec editor: one place for what
 * saving a revision says (the note, why it cannot be saved yet, a conflict with a newer revision,
 * the result).
 */
export function SaveRevisionBar({
  formLabel,
  noteLabel,
  noteHint,
  placeholder,
  note,
  onNote,
  revisionNumber,
  blocked,
  pending,
  error,
  savedNumber,
  onSave,
  children,
}: {
  /** The form's accessible name. */
  formLabel: string;
  noteLabel: string;
  noteHint: string;
  placeholder: string;
  note: string;
  onNote: (note: string) => void;
  /** The current revision's number; null before the first. */
  revisionNumber: number | null;
  /** Why saving is not possible now (shown beside the button), true to disable it without words, or null. */
  blocked: string | boolean | null;
  pending: boolean;
  error: Error | null;
  /** The number of the revision just saved here, if any. */
  savedNumber?: number | null;
  onSave: () => void;
  /** More actions and remarks beside the save button. */
  children?: ReactNode;
}) {
  const conflict = error instanceof ApiError && error.status === 409;
  // On a signed-off figure, saving asks first: the sign-off would go stale.
  const guard = useSignedOffGuard(onSave);
  return (
    <form
      className="space-y-2"
      aria-label={formLabel}
      onSubmit={(e) => {
        e.preventDefault();
        guard.request();
      }}
    >
      <Field label={noteLabel} hint={noteHint}>
        <TextInput value={note} onChange={(e) => onNote(e.target.value)} placeholder={placeholder} />
      </Field>
      <div className="flex flex-wrap items-center gap-3">
        <Button type="submit" disabled={Boolean(blocked) || pending}>
          {pending ? "Saving…" : revisionNumber !== null ? `Save as revision ${revisionNumber + 1}` : "Save revision 1"}
        </Button>
        {typeof blocked === "string" && blocked ? <span className="text-xs text-muted">{blocked}</span> : null}
        {children}
      </div>
      {guard.warning}
      {conflict ? (
        <div role="alert" className="rounded-sm border border-bad bg-[#fbeeee] p-3 text-sm text-bad">
          <p className="font-semibold">
            <span aria-hidden>✕ </span>This panel changed since you opened it — reload.
          </p>
          <p className="mt-1 text-xs">Someone saved a newer revision. Copy your changes if you want to keep them, then reload and make them again.</p>
          <Button type="button" variant="danger" className="mt-2" onClick={() => window.location.reload()}>
            Reload
          </Button>
        </div>
      ) : error ? (
        <p role="alert" className="text-sm text-bad">
          <span aria-hidden>✕ </span>
          {error.message}
        </p>
      ) : null}
      {savedNumber ? (
        <p role="status" className="text-sm text-good">
          <span aria-hidden>✓ </span>Saved revision {savedNumber}.
        </p>
      ) : null}
    </form>
  );
}
