import type { ReactNode } from "react";
import { signOutAction } from "@/app/actions/auth";
import { MainNav } from "@/components/main-nav";
import { Providers } from "@/components/providers";
import { headers } from "next/headers";
import { requireUser } from "@/lib/http/session";
import { outboxViewFor } from "@/lib/server/mail/outbox-access";

export const dynamic = "force-dynamic";

export default async function AppLayout({ children }: { children: ReactNode }) {
  const user = await requireUser();
  const outbox = await outboxViewFor(await headers(), user);
  return (
    <Providers>
      <div className="min-h-screen print:min-h-0">
        <header className="border-b border-rule bg-sheet print:hidden">
          <MainNav userName={user.name} userEmail={user.email} showOutbox={Boolean(outbox)} signOut={signOutAction} />
        </header>
        <main className="mx-auto max-w-6xl px-4 py-6 sm:px-6 sm:py-8 print:max-w-none print:p-0">{children}</main>
      </div>
    </Providers>
  );
}
