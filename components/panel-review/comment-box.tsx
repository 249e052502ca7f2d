"use client";
import { useRef } from "react";
import { Button } from "@/components/ui";
import { CommentEditor, useCommentEditor, type JSONContent } from "./comment-editor";
import type { MentionItem } from "./mention-list";
import { RICH_TEXT } from "./rich-text-look";

/**
 * An editor with a send button. The client key stays the same until a send succeeds, so
 * retrying after a failure can never store the comment twice.
 */
export function CommentBox({
  members,
  initial,
  label,
  submitLabel,
  busy,
  onSubmit,
  onCancel,
  autofocus = false,
  children,
}: {
  members: MentionItem[];
  initial?: JSONContent | null;
  label: string;
  submitLabel: string;
  busy?: boolean;
  onSubmit: (v: { body: JSONContent; text: string; clientKey: string }) => Promise<unknown>;
  onCancel?: () => void;
  autofocus?: boolean;
  children?: React.ReactNode;
}) {
  const editor = useCommentEditor(members, initial, label, autofocus);
  const clientKey = useRef<string>(newKey());
  async function send() {
    if (!editor || editor.isEmpty) return;
    const body = editor.getJSON();
    editor.commands.clearContent();
    try {
      await onSubmit({ body, text: textOf(body), clientKey: clientKey.current });
      clientKey.current = newKey();
    } catch {
      // The caller shows the error; the text comes back and the key stays, for a retry.
      editor.commands.setContent(body);
    }
  }
  return (
    <div className={RICH_TEXT}>
      <CommentEditor editor={editor} />
      {children}
      <div className="mt-2 flex items-center gap-2">
        <Button type="button" onClick={() => void send()} disabled={busy || !editor}>
          {submitLabel}
        </Button>
        {onCancel ? (
          <Button type="button" variant="quiet" onClick={onCancel}>
            Cancel
          </Button>
        ) : null}
      </div>
    </div>
  );
}

function textOf(node: JSONContent): string {
  if (node.type === "text") return node.text ?? "";
  if (node.type === "mention") return `@${String(node.attrs?.label ?? "")}`;
  return (node.content ?? []).map(textOf).join(node.type === "doc" ? "\n" : "");
}

function newKey(): string {
  return typeof crypto !== "undefined" && "randomUUID" in crypto ? crypto.randomUUID() : `${Date.now()}-${Math.random().toString(36).slice(2)}`;
}
