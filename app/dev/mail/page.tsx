import Link from "next/link";
import { headers } from "next/headers";
import { notFound } from "next/navigation";
import { EmptyState, PageHeader } from "@/components/ui";
import { env } from "@/lib/env";
import { currentUser } from "@/lib/http/session";
import { outboxViewFor, visibleTo } from "@/lib/server/mail/outbox-access";
import { listSinkMessages } from "@/lib/server/mail/sink-store";

export const metadata = { title: "Mail outbox" };
export const dynamic = "force-dynamic";

// Demo and development: the messages the local SMTP sink received, so links can be clicked.
export default async function MailOutboxPage() {
  const view = await outboxViewFor(await headers(), await currentUser());
  if (!view) notFound();
  const messages = listSinkMessages().filter((m) => visibleTo(view, m));
  const who = view.kind === "all" ? "every message, shown to this machine only" : `messages to ${view.email} only`;
  return (
    <main className="mx-auto max-w-4xl px-6 py-8">
      <PageHeader
        title="Mail outbox"
        subtitle={`Local SMTP sink on port ${env().smtpPort} · ${messages.length} message(s) · ${who}`}
        actions={
          <Link href="/manuscripts" className="text-sm underline">
            Back to Prooflight
          </Link>
        }
      />
      <p className="mb-4 rounded-sm border border-rule bg-sheet px-4 py-2 text-sm text-muted" role="note">
        <span aria-hidden>△ </span>A demo instance: these messages hold sign-in links. Never run a demo where others can reach it.
      </p>
      {messages.length === 0 ? (
        <EmptyState title="No mail received yet" />
      ) : (
        <ul className="divide-y divide-rule rounded-sm border border-rule bg-sheet" aria-label="Received messages">
          {messages.map((m) => (
            <li key={m.id}>
              <Link href={`/dev/mail/${m.id}`} className="flex flex-wrap gap-x-4 px-5 py-3 hover:bg-paper">
                <span className="w-60 truncate text-sm text-muted">{m.envelope.to.join(", ")}</span>
                <span className="flex-1 font-medium">{m.subject}</span>
                <time className="text-xs text-muted">{m.receivedAt.replace("T", " ").slice(0, 19)}</time>
              </Link>
            </li>
          ))}
        </ul>
      )}
    </main>
  );
}
