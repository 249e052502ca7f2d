import Link from "next/link";
import { EmptyState, PageHeader, RoleBadge, Sheet } from "@/components/ui";
import { formatDate } from "@/lib/data/format";
import { requireUser } from "@/lib/http/session";
import { listLabsForUser, listManuscriptsForUser } from "@/lib/server/manuscripts";
import { NewManuscriptForm } from "./_components/new-manuscript-form";

export const metadata = { title: "Manuscripts" };

export default async function ManuscriptsPage() {
  const user = await requireUser();
  const [labs, manuscripts] = await Promise.all([listLabsForUser(user), listManuscriptsForUser(user)]);
  return (
    <>
      <PageHeader
        title="Manuscripts"
        subtitle={labs.length ? `Labs: ${labs.map((l) => l.name).join(" · ")}` : "You are not in a lab; you see the manuscripts you were invited to."}
      />
      <div className="grid gap-6 lg:grid-cols-[1fr_320px]">
        <div>
          {manuscripts.length === 0 ? (
            <EmptyState title="No manuscripts yet">Create one, or ask a PI to invite you.</EmptyState>
          ) : (
            <ul className="divide-y divide-rule rounded-sm border border-rule bg-sheet" aria-label="Your manuscripts">
              {manuscripts.map((m) => (
                <li key={m.id} className="flex flex-wrap items-center gap-3 px-5 py-4">
                  <div className="min-w-0 flex-1">
                    <Link href={`/manuscripts/${m.id}`} className="font-medium text-ink hover:underline">
                      {m.title}
                    </Link>
                    <p className="text-xs text-muted">
                      {m.labName} · created {formatDate(m.createdAt)}
                    </p>
                  </div>
                  <RoleBadge role={m.role} />
                </li>
              ))}
            </ul>
          )}
        </div>
        {labs.length ? (
          <Sheet>
            <h2 className="mb-3 text-sm font-semibold">New manuscript</h2>
            <NewManuscriptForm labs={labs.map((l) => ({ id: l.id, name: l.name }))} />
          </Sheet>
        ) : null}
      </div>
    </>
  );
}
