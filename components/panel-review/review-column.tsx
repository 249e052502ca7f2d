"use client";
import { useState } from "react";
import { roleAllows } from "@/lib/authz/policy";
import type { MemberView, PanelView, ThreadAnchor } from "@/components/figures/api";
import type { PickMode } from "@/components/figures/chart-anchors";
import { describeAnchor } from "@/components/figures/format";
import { ReviewStateBadge } from "@/components/figures/review-state";
import { CommentBox } from "./comment-box";
import { DecisionBox } from "./decision-box";
import { DecisionsList } from "./decisions-list";
import { ThreadItem } from "./thread-item";
import { useThreadActions, useThreads } from "./use-threads";

const ROLE_WORD = { pi: "PI", author: "author", reviewer: "reviewer", viewer: "viewer" } as const;

/** The conversation beside the panel: review state, decisions, and the threads anchored to the plot. */
export function ReviewColumn({
  panel,
  members,
  me,
  pickMode,
  onPickMode,
  draftAnchor,
  onDraftAnchor,
}: {
  panel: PanelView;
  members: MemberView[];
  me: { id: string; name: string };
  pickMode: PickMode;
  onPickMode: (m: PickMode) => void;
  draftAnchor: ThreadAnchor | null;
  onDraftAnchor: (a: ThreadAnchor | null) => void;
}) {
  const threads = useThreads(panel.id);
  const actions = useThreadActions(panel.id, me);
  const [error, setError] = useState<string | null>(null);
  const name = (id: string) => members.find((m) => m.userId === id)?.name ?? id;
  const mentionable = members.filter((m) => m.userId !== me.id).map((m) => ({ id: m.userId, label: m.name, role: ROLE_WORD[m.role] }));
  const canWrite = roleAllows(panel.role, "comment.write");
  const rev = panel.currentRevision;
  const all = threads.data ?? [];
  const open = all.filter((t) => t.status === "open");
  const resolved = all.filter((t) => t.status !== "open");
  const numberOf = (id: string) => all.findIndex((t) => t.id === id) + 1;
  const threadItem = (t: (typeof all)[number]) => (
    <ThreadItem
      key={t.id}
      thread={t}
      index={numberOf(t.id)}
      currentRevisionNumber={rev?.number ?? null}
      me={me.id}
      members={mentionable}
      canWrite={canWrite}
      actions={actions}
    />
  );
  const pick = (m: PickMode) => onPickMode(pickMode === m ? "none" : m);

  return (
    <div className="space-y-5" data-testid="review-column">
      <section aria-labelledby="review-heading" className="rounded-sm border border-rule bg-sheet p-4">
        <h2 id="review-heading" className="flex items-center justify-between gap-2 text-sm font-semibold">
          Review{" "}
          <span data-testid="panel-review-state">
            <ReviewStateBadge state={panel.reviewState} />
          </span>
        </h2>
        {rev ? (
          <dl className="mt-2 space-y-1 text-sm">
            <div>
              <dt className="inline text-muted">Approved by </dt>
              <dd className="inline">{panel.approvedBy.length ? panel.approvedBy.map(name).join(", ") : "nobody yet"}</dd>
            </div>
            {panel.needsRevisionBy.length ? (
              <div>
                <dt className="inline text-muted">Asked for revision </dt>
                <dd className="inline text-bad">{panel.needsRevisionBy.map(name).join(", ")}</dd>
              </div>
            ) : null}
            <div>
              <dt className="inline text-muted">Still waiting on </dt>
              <dd className="inline">
                {panel.waitingOn.length ? panel.waitingOn.map(name).join(", ") : panel.reviewState === "in_review" ? "one approval by anyone" : "nobody"}
              </dd>
            </div>
          </dl>
        ) : null}
        <div className="mt-3 border-t border-rule pt-3">
          <DecisionBox panel={panel} me={me.id} />
        </div>
      </section>

      <section aria-labelledby="threads-heading">
        <h2 id="threads-heading" className="mb-2 text-sm font-semibold">
          Threads <span className="font-normal text-muted">· {open.length} open</span>
        </h2>
        {canWrite && rev ? (
          <div className="mb-3 rounded-sm border border-rule bg-sheet p-3" aria-label="New thread" role="group">
            <p className="mb-2 text-xs text-muted">
              New thread on revision {rev.number}, about{" "}
              {draftAnchor ? (
                <b className="text-ink" data-testid="draft-anchor">
                  {describeAnchor(draftAnchor)}
                </b>
              ) : (
                "the whole panel"
              )}
            </p>
            <div className="mb-2 flex flex-wrap gap-1.5 text-xs">
              <button
                type="button"
                aria-pressed={pickMode === "point"}
                className={`rounded-sm border px-2 py-1 ${pickMode === "point" ? "border-accent bg-accent text-white" : "border-rule"}`}
                onClick={() => pick("point")}
              >
                ⊕ Mark a point
              </button>
              <button
                type="button"
                aria-pressed={pickMode === "xrange"}
                className={`rounded-sm border px-2 py-1 ${pickMode === "xrange" ? "border-accent bg-accent text-white" : "border-rule"}`}
                onClick={() => pick("xrange")}
              >
                ↔ Mark an x-range
              </button>
              {draftAnchor ? (
                <button type="button" className="rounded-sm border border-rule px-2 py-1" onClick={() => onDraftAnchor(null)}>
                  Clear mark
                </button>
              ) : null}
            </div>
            {pickMode !== "none" ? (
              <p className="mb-2 text-xs text-accent" role="status">
                {pickMode === "point" ? "Click the point on the plot." : "Drag across the plot to mark the x-range."}
              </p>
            ) : null}
            <CommentBox
              members={mentionable}
              label="New comment"
              submitLabel="Post comment"
              busy={actions.start.isPending}
              onSubmit={async (v) => {
                setError(null);
                try {
                  await actions.start.mutateAsync({ ...v, anchor: draftAnchor, revisionId: rev.id, revisionNumber: rev.number });
                  onDraftAnchor(null);
                } catch (e) {
                  setError((e as Error).message);
                  throw e;
                }
              }}
            />
            {error ? (
              <p role="alert" className="mt-1 text-xs text-bad">
                ✕ {error} — your text is kept; post again to retry.
              </p>
            ) : null}
          </div>
        ) : null}
        {threads.isLoading ? <p className="text-sm text-muted">loading…</p> : null}
        {threads.isError ? (
          <p role="alert" className="text-sm text-bad">
            ✕ {threads.error.message}
          </p>
        ) : null}
        <ul className="space-y-3" aria-label="Open threads">
          {open.map(threadItem)}
        </ul>
        {!threads.isLoading && !open.length ? <p className="text-sm text-muted">No open threads.</p> : null}
        {resolved.length ? (
          <details className="mt-3">
            <summary className="cursor-pointer text-sm text-muted">
              {resolved.length} resolved thread{resolved.length === 1 ? "" : "s"}
            </summary>
            <ul className="mt-2 space-y-3">{resolved.map(threadItem)}</ul>
          </details>
        ) : null}
        {actions.resolve.isError ? (
          <p role="alert" className="mt-1 text-xs text-bad">
            ✕ {(actions.resolve.error as Error).message}
          </p>
        ) : null}
      </section>

      <section aria-labelledby="decisions-heading">
        <h2 id="decisions-heading" className="mb-2 text-sm font-semibold">
          Decisions
        </h2>
        <DecisionsList decisions={panel.decisions} />
      </section>
    </div>
  );
}
