import Link from "next/link";
import { redirect } from "next/navigation";
import { headers } from "next/headers";
import { currentUser } from "@/lib/http/session";
import { outboxViewFor } from "@/lib/server/mail/outbox-access";
import { SignInForms } from "./_components/sign-in-forms";

export const metadata = { title: "Sign in" };
export const dynamic = "force-dynamic";

export default async function SignInPage({ searchParams }: { searchParams: Promise<{ next?: string }> }) {
  if (await currentUser()) redirect("/manuscripts");
  const { next } = await searchParams;
  const outbox = await outboxViewFor(await headers(), null);
  return (
    <main className="mx-auto flex min-h-screen max-w-md flex-col justify-center px-6 py-12">
      <p className="text-sm font-semibold uppercase tracking-[0.2em] text-accent">Prooflight</p>
      <h1 className="mt-2 text-2xl font-semibold">Sign in to your figures</h1>
      <p className="mt-1 mb-8 text-sm text-muted">Accounts are by invitation from a manuscript&apos;s PI.</p>
      <div className="rounded-sm border border-rule bg-sheet p-6">
        <SignInForms next={next} />
      </div>
      {outbox ? (
        <p className="mt-6 text-center text-xs text-muted">
          Demo instance, seen from this machine: mail goes to the local sink — read it in the{" "}
          <Link className="underline" href="/dev/mail">
            mail outbox
          </Link>
          .
        </p>
      ) : null}
    </main>
  );
}
