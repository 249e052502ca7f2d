import Link from "next/link";
import type { ReactNode } from "react";
import { signOutAction } from "@/app/actions/auth";
import { ActionForm } from "@/components/action-form";
import { Providers } from "@/components/providers";
import { WaitingOnMeLink } from "@/components/review/waiting-on-me-link";
import { headers } from "next/headers";
import { requireUser } from "@/lib/http/session";
import { outboxViewFor } from "@/lib/server/mail/outbox-access";

export const dynamic = "force-dynamic";

export default async function AppLayout({ children }: { children: ReactNode }) {
  const user = await requireUser();
  const outbox = await outboxViewFor(await headers(), user);
  return (
    <Providers>
      <div className="min-h-screen">
        <header className="border-b border-rule bg-sheet">
          <nav aria-label="Main" className="mx-auto flex max-w-6xl flex-wrap items-center gap-x-6 gap-y-2 px-6 py-3 text-sm">
            <Link href="/manuscripts" className="font-semibold uppercase tracking-[0.18em] text-accent">
              Prooflight
            </Link>
            <Link href="/manuscripts" className="hover:underline">
              Manuscripts
            </Link>
            <WaitingOnMeLink />
            <Link href="/calculators" className="hover:underline">
              Calculators
            </Link>
            <Link href="/settings/tokens" className="hover:underline">
              API tokens
            </Link>
            {outbox ? (
              <Link href="/dev/mail" className="hover:underline">
                Mail outbox
              </Link>
            ) : null}
            <span className="ml-auto text-muted" data-testid="signed-in-as">
              {user.name} · {user.email}
            </span>
            <ActionForm action={signOutAction}>
              <button type="submit" className="rounded-sm border border-rule px-2 py-1 hover:bg-paper">
                Sign out
              </button>
            </ActionForm>
          </nav>
        </header>
        <main className="mx-auto max-w-6xl px-6 py-8">{children}</main>
      </div>
    </Providers>
  );
}
