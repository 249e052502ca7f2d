"use client";
import { useEffect, useRef, useState } from "react";
import { ApiError } from "@/components/api-client";
import { describeAnchor } from "@/components/figures/format";
import { CommentBox } from "./comment-box";
import type { MentionItem } from "./mention-list";
import { RICH_TEXT } from "./rich-text-look";
import type { ShownComment, ShownThread, useThreadActions } from "./use-threads";
import { RelativeTime } from "@/components/review/relative-time";

const EDIT_WINDOW_MS = 15 * 60 * 1000;

/** One thread: its anchor and the revision it was written on, the comments, reply, resolve / reopen. */
export function ThreadItem({
  thread,
  index,
  currentRevisionNumber,
  me,
  members,
  canWrite,
  actions,
}: {
  thread: ShownThread;
  index: number;
  currentRevisionNumber: number | null;
  me: string;
  members: MentionItem[];
  canWrite: boolean;
  actions: ReturnType<typeof useThreadActions>;
}) {
  const [replying, setReplying] = useState(false);
  const [error, setError] = useState<string | null>(null);
  const self = useRef<HTMLLIElement>(null);
  // A mail's link names the thread (#thread-<id>); threads arrive after the page, so scroll once this one is there.
  useEffect(() => {
    if (window.location.hash === `#thread-${thread.id}`) self.current?.scrollIntoView({ block: "start" });
  }, [thread.id]);
  const resolved = thread.status === "resolved";
  const older = currentRevisionNumber !== null && thread.revisionNumber !== currentRevisionNumber;
  return (
    <li
      ref={self}
      id={`thread-${thread.id}`}
      className={`scroll-mt-4 rounded-sm border bg-sheet p-3 ${resolved ? "border-rule opacity-80" : "border-rule"}`}
      data-testid="thread"
      aria-label={`Thread ${index}`}
    >
      <div className="mb-2 flex flex-wrap items-center gap-x-2 gap-y-1 text-xs">
        <span className="rounded-sm bg-[#fbefe6] px-1.5 font-semibold text-[#a34700]">#{index}</span>
        <span data-testid="thread-anchor">{describeAnchor(thread.anchor)}</span>
        <span className={older ? "font-medium text-warn" : "text-muted"}>
          · written on revision {thread.revisionNumber}
          {older ? "" : " (current)"}
        </span>
        <span className="ml-auto">{resolved ? <span className="text-good">✓ Resolved</span> : <span>○ Open</span>}</span>
      </div>
      <ol className="space-y-2">
        {thread.comments.map((c) => (
          <CommentItem key={c.id} c={c} me={me} members={members} actions={actions} />
        ))}
      </ol>
      {thread.pending ? <p className="mt-1 text-xs text-muted">sending…</p> : <FollowSwitch thread={thread} actions={actions} />}
      {canWrite && !thread.pending ? (
        <div className="mt-2">
          {replying ? (
            <CommentBox
              autofocus
              members={members}
              label={`Reply in thread ${index}`}
              submitLabel="Send reply"
              busy={actions.reply.isPending}
              onCancel={() => setReplying(false)}
              onSubmit={async (v) => {
                setError(null);
                try {
                  await actions.reply.mutateAsync({ threadId: thread.id, ...v });
                  setReplying(false);
                } catch (e) {
                  setError((e as Error).message);
                  throw e;
                }
              }}
            />
          ) : (
            <div className="flex gap-3 text-xs">
              <button type="button" className="underline" onClick={() => setReplying(true)}>
                Reply
              </button>
              <button type="button" className="underline" onClick={() => actions.resolve.mutate({ threadId: thread.id, reopen: resolved })}>
                {resolved ? "Reopen" : "Resolve"}
              </button>
            </div>
          )}
          {error ? (
            <p role="alert" className="mt-1 text-xs text-bad">
              ✕ {error}
            </p>
          ) : null}
        </div>
      ) : null}
    </li>
  );
}

/** Whether replies in this thread reach the reader by mail; anyone who can read the thread may choose. */
function FollowSwitch({ thread, actions }: { thread: ShownThread; actions: ReturnType<typeof useThreadActions> }) {
  const on = thread.followingReplies;
  return (
    <p className="mt-2 text-xs text-muted">
      <button type="button" className="underline" aria-pressed={on} onClick={() => actions.follow.mutate({ threadId: thread.id, following: !on })}>
        Mail me replies
      </button>{" "}
      <span>{on ? "— on: you get a mail when someone replies here" : "— off"}</span>
    </p>
  );
}

/** Whether a comment written at `createdAt` is still inside the edit window; turns false when the window closes. */
function useEditWindow(createdAt: string | Date): boolean {
  const closesAt = new Date(createdAt).getTime() + EDIT_WINDOW_MS;
  const [open, setOpen] = useState(() => Date.now() < closesAt);
  useEffect(() => {
    const t = setTimeout(() => setOpen(Date.now() < closesAt), Math.max(0, closesAt - Date.now()));
    return () => clearTimeout(t);
  }, [closesAt]);
  return open;
}

function CommentItem({ c, me, members, actions }: { c: ShownComment; me: string; members: MentionItem[]; actions: ReturnType<typeof useThreadActions> }) {
  const [editing, setEditing] = useState(false);
  const [error, setError] = useState<string | null>(null);
  const windowOpen = useEditWindow(c.createdAt);
  const mayEdit = !c.pendingText && c.createdBy === me && windowOpen;
  return (
    <li className="text-sm" data-testid="comment">
      <p className="text-xs text-muted">
        <span className="font-medium text-ink">{c.authorName}</span> · <RelativeTime at={c.createdAt} />
        {c.editedAt ? " · edited" : ""}
        {mayEdit && !editing ? (
          <>
            {" "}
            ·{" "}
            <button type="button" className="underline" onClick={() => setEditing(true)}>
              Edit
            </button>
          </>
        ) : null}
      </p>
      {editing ? (
        <CommentBox
          autofocus
          members={members}
          initial={c.body}
          label="Edit comment"
          submitLabel="Save edit"
          busy={actions.edit.isPending}
          onCancel={() => setEditing(false)}
          onSubmit={async ({ body }) => {
            setError(null);
            try {
              await actions.edit.mutateAsync({ commentId: c.id, body, baseEditedAt: c.editedAt ? new Date(c.editedAt).getTime() : null });
              setEditing(false);
            } catch (e) {
              setError(
                e instanceof ApiError && e.status === 409
                  ? "Someone changed this comment since you opened it — reload to see the current text."
                  : (e as Error).message,
              );
              throw e;
            }
          }}
        />
      ) : c.pendingText !== undefined ? (
        <p className="mt-0.5 whitespace-pre-wrap text-muted" data-pending>
          {c.pendingText}
        </p>
      ) : (
        // The server renders comments from validated Tiptap JSON and sanitises the HTML with an allow-list.
        <div className={`mt-0.5 break-words ${RICH_TEXT}`} dangerouslySetInnerHTML={{ __html: c.html }} />
      )}
      {error ? (
        <p role="alert" className="mt-1 text-xs text-bad">
          ✕ {error}
        </p>
      ) : null}
    </li>
  );
}
