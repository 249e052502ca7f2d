"use client";
import type { HandEdit } from "@/lib/figures/template-record";
import { short } from "./builder-model";

/** The hand edits kept from the spec editor, the builder fields they overrule, and the way to drop them. */
export function BuilderHandEdits({
  edits,
  lost,
  dropEdits,
  onDropEdits,
  savedNumber,
  overriddenLabels,
}: {
  edits: HandEdit[];
  lost: HandEdit[];
  dropEdits: boolean;
  onDropEdits: (drop: boolean) => void;
  savedNumber: number | undefined;
  overriddenLabels: string[];
}) {
  if (!edits.length) return null;
  return (
    <section aria-label="Hand edits" className="rounded-sm border border-warn bg-[#fbf4e6] p-3 text-sm" data-testid="hand-edits">
      {dropEdits ? (
        <p>
          The {edits.length} hand edit{edits.length === 1 ? "" : "s"} of revision {savedNumber} will be dropped when you save: the spec is the template’s again.{" "}
          <button type="button" className="underline" onClick={() => onDropEdits(false)}>
            Keep them
          </button>
        </p>
      ) : (
        <>
          <p className="font-semibold text-warn">
            Edited by hand in the spec editor — kept; the builder no longer controls {edits.length === 1 ? "this field" : "these fields"} of the spec:
          </p>
          <ul className="mt-1 space-y-0.5 font-mono text-xs">
            {edits.map((e) => (
              <li key={`${e.kind}-${e.where}`}>
                <code>{e.where}</code> {e.kind === "removed" ? "removed" : e.kind === "added" ? `added: ${short(e.after)}` : `= ${short(e.after)}`}
                {lost.includes(e) ? <span className="font-sans text-bad"> — its place is gone with these options; not kept</span> : null}
              </li>
            ))}
          </ul>
          {overriddenLabels.length ? (
            <p className="mt-1 text-xs text-muted">Builder fields that change nothing drawn because of them: {overriddenLabels.join(", ")}.</p>
          ) : null}
          <button type="button" className="mt-1 text-xs underline" onClick={() => onDropEdits(true)}>
            Give them back to the builder (drop the hand edits)
          </button>
        </>
      )}
    </section>
  );
}

/** Says when the saved revision does not carry the builder's record, or names a template this version lacks. */
export function BuilderRecordNotices({ savedNumber, recordId, known }: { savedNumber: number | null; recordId: string | null; known: boolean }) {
  if (savedNumber === null) return null;
  if (!recordId)
    return (
      <p className="rounded-sm border border-rule bg-paper p-3 text-sm text-muted" data-testid="builder-no-record">
        Revision {savedNumber} was written in the spec editor (or saved before the builder recorded its settings), so the builder starts from the data’s
        defaults. Saving from here replaces its spec with the template’s.
      </p>
    );
  return known ? null : (
    <p className="rounded-sm border border-warn p-3 text-sm text-warn">
      Revision {savedNumber} was built with a template this version of Prooflight does not have (“{recordId}”).
    </p>
  );
}
