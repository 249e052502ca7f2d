import Link from "next/link";
import type { FigureView } from "@/components/figures/api";
import { RoleBadge } from "@/components/ui";
import { ArchivedPageBanner, ArchivePageButton } from "@/components/archive/archive-controls";
import { ArchivedPanels } from "@/components/archive/archived-panels";
import { roleAllows } from "@/lib/authz/policy";
import { loadOrNotFound, requireUser } from "@/lib/http/session";
import { getFigure } from "@/lib/server/figures/figures";
import { getManuscriptTitle, listMembers } from "@/lib/server/manuscripts";
import { FigureWorkspace } from "./_components/figure-workspace";

export const metadata = { title: "Figure" };

export default async function FigurePage({ params }: { params: Promise<{ id: string }> }) {
  const user = await requireUser();
  const { id } = await params;
  const figure = await loadOrNotFound(() => getFigure(user, id));
  const [title, members] = await Promise.all([getManuscriptTitle(figure.manuscriptId), listMembers(figure.manuscriptId)]);
  return (
    <>
      <nav aria-label="Breadcrumb" className="mb-2 text-sm text-muted print:hidden">
        <ol className="flex flex-wrap gap-1">
          <li>
            <Link href={`/manuscripts/${figure.manuscriptId}`} className="underline">
              {title}
            </Link>
            <span aria-hidden> /</span>
          </li>
          <li aria-current="page" className="text-ink">
            Figure {figure.number}
          </li>
          {figure.role ? (
            <li className="ml-2">
              <RoleBadge role={figure.role} />
            </li>
          ) : null}
        </ol>
      </nav>
      {figure.archivedAt ? (
        <ArchivedPageBanner
          kind="figure"
          id={figure.id}
          archivedAt={figure.archivedAt}
          canRestore={roleAllows(figure.role, "archive.manage")}
          canDelete={roleAllows(figure.role, "archive.delete")}
          afterDelete={`/manuscripts/${figure.manuscriptId}`}
        />
      ) : roleAllows(figure.role, "archive.manage") ? (
        <p className="mb-2 flex justify-end print:hidden">
          <ArchivePageButton kind="figure" id={figure.id} />
        </p>
      ) : null}
      <FigureWorkspace
        initial={JSON.parse(JSON.stringify(figure)) as FigureView}
        members={members.map(({ userId, name, email, role }) => ({ userId, name, email, role }))}
        manuscriptTitle={title}
      />
      <ArchivedPanels panels={figure.archivedPanels} canRestore={roleAllows(figure.role, "archive.manage")} />
    </>
  );
}
