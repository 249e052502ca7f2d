import Link from "next/link";
import { AppError } from "@/lib/errors";
import { describeUnsubscribe, type UnsubscribeView } from "@/lib/server/mail/unsubscribe";

export const metadata = { title: "Unsubscribe" };
export const dynamic = "force-dynamic";

/** The landing page of a mail's unsubscribe link: works signed out; says what the button turns off, then what was turned off. */
export default async function UnsubscribePage({ searchParams }: { searchParams: Promise<{ token?: string; done?: string }> }) {
  const { token, done } = await searchParams;
  let view: UnsubscribeView | null = null;
  let problem = "This page needs the link from a Prooflight mail; it has no token.";
  if (token) {
    try {
      view = await describeUnsubscribe(token);
    } catch (err) {
      if (!(err instanceof AppError)) throw err;
      problem = err.message;
    }
  }
  const off = view?.kinds.every((k) => k.alreadyOff) ?? false;
  return (
    <main className="mx-auto flex min-h-screen max-w-md flex-col justify-center px-6 py-12">
      <p className="text-sm font-semibold uppercase tracking-[0.2em] text-accent">Prooflight</p>
      <div className="mt-3 rounded-sm border border-rule bg-sheet p-6">
        {!view ? (
          <>
            <h1 className="text-xl font-semibold">This unsubscribe link cannot be used</h1>
            <p role="alert" className="mt-2 text-sm text-bad">
              ✕ {problem}
            </p>
          </>
        ) : done && off ? (
          <>
            <h1 className="text-xl font-semibold">Turned off</h1>
            <p role="status" className="mt-2 text-sm">
              ✓ {view.email} no longer gets mails about: {view.kinds.map((k) => k.label).join("; ")}.
            </p>
          </>
        ) : (
          <>
            <h1 className="text-xl font-semibold">Stop these mails?</h1>
            <p className="mt-2 text-sm">For {view.email}, this turns off mails about:</p>
            <ul className="mt-2 list-disc pl-5 text-sm">
              {view.kinds.map((k) => (
                <li key={k.kind}>
                  {k.label}
                  {k.alreadyOff ? <span className="text-muted"> (already off)</span> : null}
                </li>
              ))}
            </ul>
            <form method="post" action={`/api/unsubscribe?token=${encodeURIComponent(token!)}&via=page`} className="mt-4">
              <button type="submit" className="rounded-sm bg-accent px-3 py-1.5 text-sm font-medium text-white hover:bg-[#163d6c]">
                Turn these mails off
              </button>
            </form>
          </>
        )}
        <p className="mt-4 text-xs text-muted">
          Other mail settings: <Link href="/settings/mail">Mail settings</Link> (after signing in). Sign-in links and invitations always arrive.
        </p>
      </div>
    </main>
  );
}
