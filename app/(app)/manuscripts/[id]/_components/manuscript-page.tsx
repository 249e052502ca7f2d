import Link from "next/link";
import type { Role } from "@/db/schema";
import { RoleBadge } from "@/components/ui";
import { loadOrNotFound, requireUser } from "@/lib/http/session";
import { getManuscript } from "@/lib/server/manuscripts";

/** The signed-in person and the manuscript of a /manuscripts/[id] page; one they may not read is a 404. */
export async function loadManuscriptPage(params: Promise<{ id: string }>) {
  const user = await requireUser();
  const { id } = await params;
  const manuscript = await loadOrNotFound(() => getManuscript(user, id));
  return { user, id, manuscript };
}

/** "← title · your role" under the heading of a manuscript's sub-page. */
export function BackToManuscript({ manuscript: m, showRole = true }: { manuscript: { id: string; title: string; role: Role | null }; showRole?: boolean }) {
  return (
    <>
      <Link href={`/manuscripts/${m.id}`} className="underline">
        ← {m.title}
      </Link>
      {showRole && m.role ? (
        <>
          {" "}
          · your role <RoleBadge role={m.role} />
        </>
      ) : null}
    </>
  );
}
