"use client";
import { useMutation } from "@tanstack/react-query";
import Link from "next/link";
import { useState } from "react";
import { sendJson } from "@/components/api-client";
import { Button, Field, Notice } from "@/components/ui";

export interface OpenIssue {
  panelId: string;
  letter: string;
  state: string;
  threads: Array<{ id: string; excerpt: string }>;
}

/** What stands in the way of a clean sign-off, panel by panel, each with a link: the panel's state and its open threads' first words. */
export function OpenIssuesList({ issues }: { issues: OpenIssue[] }) {
  return (
    <ul className="ml-5 mt-1 list-disc text-ink" aria-label="Open issues">
      {issues.map((i) => (
        <li key={i.panelId}>
          <Link href={`/panels/${i.panelId}`} className="underline">
            Panel {i.letter}
          </Link>
          {i.state === "approved"
            ? " is approved"
            : i.state === "draft"
              ? " is a draft (not sent to review)"
              : ` is ${i.state.replace("_", " ")} (not approved)`}
          {i.threads.length ? (
            <ul className="ml-4 list-[circle]">
              {i.threads.map((t) => (
                <li key={t.id}>
                  Open thread:{" "}
                  <Link href={`/panels/${i.panelId}#thread-${t.id}`} className="underline">
                    “{t.excerpt}”
                  </Link>
                </li>
              ))}
            </ul>
          ) : null}
        </li>
      ))}
    </ul>
  );
}

/** The PI withdraws a sign-off with a reason; it stays on record and no longer counts. */
export function WithdrawSignoff({ figureId, signoffId, onDone }: { figureId: string; signoffId: string; onDone: () => void }) {
  const [open, setOpen] = useState(false);
  const [reason, setReason] = useState("");
  const m = useMutation({
    mutationFn: () => sendJson(`/api/figures/${figureId}/signoff/withdraw`, "POST", { signoffId, reason: reason.trim() }),
    onSuccess: () => {
      setOpen(false);
      onDone();
    },
  });
  if (!open)
    return (
      <Button type="button" variant="quiet" className="ml-[1.125rem] mt-1 px-2 py-0.5 text-xs" onClick={() => setOpen(true)}>
        Withdraw sign-off
      </Button>
    );
  return (
    <form
      className="ml-[1.125rem] mt-2 space-y-2"
      aria-label="Withdraw sign-off"
      onSubmit={(e) => {
        e.preventDefault();
        m.mutate();
      }}
    >
      <Field label="Reason for withdrawing">
        <textarea
          required
          value={reason}
          onChange={(e) => setReason(e.target.value)}
          rows={2}
          maxLength={5000}
          className="w-full rounded-sm border border-rule bg-white px-2.5 py-1.5 text-sm focus:border-accent"
        />
      </Field>
      <div className="flex flex-wrap gap-2">
        <Button type="submit" variant="danger" disabled={m.isPending || !reason.trim()}>
          {m.isPending ? "Withdrawing…" : "Withdraw with this reason"}
        </Button>
        <Button type="button" variant="quiet" onClick={() => setOpen(false)}>
          Cancel
        </Button>
      </div>
      {m.error ? <Notice ok={false}>{m.error.message}</Notice> : null}
    </form>
  );
}
