import Link from "next/link";
import { ManuscriptBoard } from "@/components/review/manuscript-board";
import { PageHeader } from "@/components/ui";
import { manuscriptActivity } from "@/lib/server/review/activity";
import { BackToManuscript, loadManuscriptPage } from "../_components/manuscript-page";

export const metadata = { title: "Figure status" };

export default async function FigureStatusPage({ params }: { params: Promise<{ id: string }> }) {
  const { user, id, manuscript: m } = await loadManuscriptPage(params);
  const activity = await manuscriptActivity(user, id);
  return (
    <>
      <PageHeader
        title="Figure status"
        subtitle={<BackToManuscript manuscript={m} />}
        actions={
          <>
            <Link href="/review" className="rounded-sm border border-rule bg-sheet px-3 py-1.5 text-sm hover:bg-paper">
              Waiting on me
            </Link>
            <Link href={`/manuscripts/${m.id}/activity`} className="rounded-sm border border-rule bg-sheet px-3 py-1.5 text-sm hover:bg-paper">
              Activity
            </Link>
          </>
        }
      />
      <ManuscriptBoard initial={m} initialActivity={activity} />
    </>
  );
}
