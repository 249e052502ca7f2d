import { PageHeader, Sheet } from "@/components/ui";
import { env } from "@/lib/env";
import { formatDate } from "@/lib/data/format";
import { requireUser } from "@/lib/http/session";
import { listApiTokens } from "@/lib/server/api-tokens";
import { NewTokenForm, RevokeTokenButton } from "./_components/token-forms";

export const metadata = { title: "API tokens" };

export default async function TokensPage() {
  const user = await requireUser();
  const tokens = await listApiTokens(user);
  return (
    <>
      <PageHeader title="API tokens" subtitle="For scripts on instrument PCs: send Authorization: Bearer <token>. A token acts as you, with your roles." />
      <div className="grid gap-6 lg:grid-cols-[minmax(0,1fr)_340px]">
        <div className="relative min-w-0 self-start overflow-x-auto">
          <table className="w-full border border-rule bg-sheet text-sm">
            <caption className="sr-only">Your API tokens</caption>
            <thead className="bg-paper text-left text-xs uppercase tracking-wide text-muted">
              <tr>
                <th className="px-4 py-2">Name</th>
                <th className="px-4 py-2">Starts with</th>
                <th className="px-4 py-2">Created</th>
                <th className="px-4 py-2">Last used</th>
                <th className="px-4 py-2">State</th>
              </tr>
            </thead>
            <tbody className="divide-y divide-rule">
              {tokens.length === 0 ? (
                <tr>
                  <td colSpan={5} className="px-4 py-6 text-center text-muted">
                    No tokens yet.
                  </td>
                </tr>
              ) : null}
              {tokens.map((t) => (
                <tr key={t.id}>
                  <td className="px-4 py-2.5 font-medium">{t.name}</td>
                  <td className="px-4 py-2.5 font-mono text-xs">{t.prefix}…</td>
                  <td className="px-4 py-2.5">{formatDate(t.createdAt)}</td>
                  <td className="px-4 py-2.5">{formatDate(t.lastUsedAt)}</td>
                  <td className="px-4 py-2.5">{t.revokedAt ? <span>⊘ revoked</span> : <RevokeTokenButton tokenId={t.id} name={t.name} />}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
        <Sheet>
          <h2 className="mb-3 text-sm font-semibold">New token</h2>
          <NewTokenForm />
          <p className="mt-4 text-xs text-muted">
            From a shell: <code className="break-all">curl -H &quot;Authorization: Bearer $TOKEN&quot; {env().appUrl}/api/me</code>
          </p>
        </Sheet>
      </div>
    </>
  );
}
