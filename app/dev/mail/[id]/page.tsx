import Link from "next/link";
import { headers } from "next/headers";
import { notFound } from "next/navigation";
import { PageHeader } from "@/components/ui";
import { currentUser } from "@/lib/http/session";
import { outboxViewFor, visibleTo } from "@/lib/server/mail/outbox-access";
import { getSinkMessage } from "@/lib/server/mail/sink-store";

export const dynamic = "force-dynamic";

export default async function MailMessagePage({ params }: { params: Promise<{ id: string }> }) {
  const view = await outboxViewFor(await headers(), await currentUser());
  if (!view) notFound();
  const m = getSinkMessage((await params).id);
  if (!m || !visibleTo(view, m)) notFound();
  const links = [...m.text.matchAll(/https?:\/\/\S+/g)].map((x) => x[0]);
  return (
    <main className="mx-auto max-w-4xl px-6 py-8">
      <PageHeader
        title={m.subject}
        subtitle={`To ${m.envelope.to.join(", ")} · from ${m.envelope.from ?? "?"} · ${m.receivedAt}`}
        actions={
          <Link href="/dev/mail" className="text-sm underline">
            All messages
          </Link>
        }
      />
      {links.length ? (
        <ul className="mb-4 space-y-1 text-sm" aria-label="Links in this message">
          {links.map((href) => (
            <li key={href}>
              <a className="break-all text-accent underline" href={href}>
                {href}
              </a>
            </li>
          ))}
        </ul>
      ) : null}
      <pre className="whitespace-pre-wrap rounded-sm border border-rule bg-sheet p-4 text-sm">{m.text}</pre>
      {m.html ? <iframe title="HTML version" sandbox="" srcDoc={m.html} className="mt-4 h-96 w-full rounded-sm border border-rule bg-white" /> : null}
    </main>
  );
}
