import { ActionForm } from "@/components/action-form";
import { Button } from "@/components/ui";
import { signInWithLinkAction } from "@/app/actions/auth";

export const metadata = { title: "Sign in with a link" };

// The link only shows a button: mail scanners that follow links must not use up the single-use token.
export default async function SignInLinkPage({ searchParams }: { searchParams: Promise<{ token?: string }> }) {
  const { token } = await searchParams;
  return (
    <main className="mx-auto flex min-h-screen max-w-md flex-col justify-center px-6">
      <div className="rounded-sm border border-rule bg-sheet p-6">
        <h1 className="text-xl font-semibold">Sign in to Prooflight</h1>
        {token ? (
          <ActionForm action={signInWithLinkAction} hidden={{ token }} className="mt-4">
            <p className="mb-4 text-sm text-muted">This link works once and expires 15 minutes after it was sent.</p>
            <Button type="submit">Continue and sign in</Button>
          </ActionForm>
        ) : (
          <p className="mt-3 text-sm text-bad">✕ The link has no token. Ask for a new one on the sign-in page.</p>
        )}
      </div>
    </main>
  );
}
