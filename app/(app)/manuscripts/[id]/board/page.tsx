import Link from "next/link";
import { ManuscriptBoard } from "@/components/review/manuscript-board";
import { PageHeader, RoleBadge } from "@/components/ui";
import { loadOrNotFound, requireUser } from "@/lib/http/session";
import { getManuscript } from "@/lib/server/manuscripts";
import { manuscriptActivity } from "@/lib/server/review/activity";

export const metadata = { title: "Review board" };

export default async function ManuscriptBoardPage({ params }: { params: Promise<{ id: string }> }) {
  const user = await requireUser();
  const { id } = await params;
  const m = await loadOrNotFound(() => getManuscript(user, id));
  const activity = await manuscriptActivity(user, id);
  return (
    <>
      <PageHeader
        title="Review board"
        subtitle={<><Link href={`/manuscripts/${m.id}`} className="underline">← {m.title}</Link> · your role <RoleBadge role={m.role!} /></>}
        actions={<>
          <Link href="/review" className="rounded-sm border border-rule bg-sheet px-3 py-1.5 text-sm hover:bg-paper">Waiting on me</Link>
          <Link href={`/manuscripts/${m.id}/activity`} className="rounded-sm border border-rule bg-sheet px-3 py-1.5 text-sm hover:bg-paper">Activity</Link>
        </>}
      />
      <ManuscriptBoard initial={m} initialActivity={activity} />
    </>
  );
}
