import Link from "next/link";
import { ActivityLog } from "@/components/review/activity-log";
import { PageHeader, Sheet } from "@/components/ui";
import { loadOrNotFound, requireUser } from "@/lib/http/session";
import { getManuscriptTitle } from "@/lib/server/manuscripts";
import { manuscriptActivity } from "@/lib/server/review/activity";

export const metadata = { title: "Activity" };

export default async function ManuscriptActivityPage({ params }: { params: Promise<{ id: string }> }) {
  const user = await requireUser();
  const { id } = await params;
  const items = await loadOrNotFound(() => manuscriptActivity(user, id));
  const title = await getManuscriptTitle(id);
  return (
    <>
      <PageHeader
        title="Activity"
        subtitle={
          <Link href={`/manuscripts/${id}`} className="underline">
            ← {title}
          </Link>
        }
        actions={
          <Link href={`/manuscripts/${id}/status`} className="rounded-sm border border-rule bg-sheet px-3 py-1.5 text-sm hover:bg-paper">
            Figure status
          </Link>
        }
      />
      <div className="grid gap-6 lg:grid-cols-[1fr_260px]">
        <ActivityLog manuscriptId={id} initial={items} />
        <Sheet className="h-fit text-sm">
          <h2 className="font-semibold">A log that cannot be quietly edited</h2>
          <p className="mt-2 text-muted">
            Every change is appended, never rewritten. Each entry carries the SHA-256 of the entry before it, so altering or removing one breaks every link
            after it. The short code beside an entry is its own hash; hover for all 64 digits.
          </p>
          <p className="mt-2 text-muted">
            <code className="rounded-sm bg-paper px-1 font-mono text-xs text-ink">npm run audit:verify</code> re-walks the whole chain and reports the first
            break.
          </p>
        </Sheet>
      </div>
    </>
  );
}
