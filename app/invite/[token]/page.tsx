import Link from "next/link";
import { RoleBadge } from "@/components/ui";
import { describeInvitation } from "@/lib/server/members";
import { AcceptForm } from "./_components/accept-form";

export const metadata = { title: "Invitation" };
export const dynamic = "force-dynamic";

export default async function InvitationPage({ params }: { params: Promise<{ token: string }> }) {
  const { token } = await params;
  const inv = await describeInvitation(token);
  return (
    <main className="mx-auto flex min-h-screen max-w-md flex-col justify-center px-6 py-12">
      <p className="text-sm font-semibold uppercase tracking-[0.2em] text-accent">Prooflight</p>
      <div className="mt-3 rounded-sm border border-rule bg-sheet p-6">
        {!inv ? (
          <>
            <h1 className="text-xl font-semibold">This invitation cannot be used</h1>
            <p className="mt-2 text-sm text-muted">
              ✕ It is unknown, already used or expired (invitations last 7 days). Ask the manuscript&apos;s PI for a new one.
            </p>
            <Link href="/sign-in" className="mt-4 inline-block text-sm underline">
              Sign in
            </Link>
          </>
        ) : (
          <>
            <h1 className="text-xl font-semibold">Join “{inv.manuscriptTitle}”</h1>
            <p className="mt-2 flex items-center gap-2 text-sm text-muted">
              For {inv.email} as <RoleBadge role={inv.role} />
            </p>
            <AcceptForm token={token} hasAccount={inv.hasAccount} />
          </>
        )}
      </div>
    </main>
  );
}
