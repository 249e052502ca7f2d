import Link from "next/link";
import { panelWidthMm } from "@/components/figures/format";
import { RoleBadge } from "@/components/ui";
import { loadOrNotFound, requireUser } from "@/lib/http/session";
import { listDatasets } from "@/lib/server/datasets/read-datasets";
import { getFigure } from "@/lib/server/figures/figures";
import { getPanel } from "@/lib/server/figures/panels";
import { getManuscriptTitle, listMembers } from "@/lib/server/manuscripts";
import { PanelEdges } from "./_components/panel-edges";
import { PanelWorkspace } from "./_components/panel-workspace";

export const metadata = { title: "Panel" };

const wire = <T,>(v: T): T => JSON.parse(JSON.stringify(v)) as T;

export default async function PanelPage({ params }: { params: Promise<{ id: string }> }) {
  const user = await requireUser();
  const { id } = await params;
  const panel = await loadOrNotFound(() => getPanel(user, id));
  const [figure, members, datasets, title] = await Promise.all([
    getFigure(user, panel.figureId),
    listMembers(panel.manuscriptId),
    listDatasets(user, panel.manuscriptId),
    getManuscriptTitle(panel.manuscriptId),
  ]);
  return (
    <>
      <nav aria-label="Breadcrumb" className="mb-2 text-sm text-muted">
        <ol className="flex flex-wrap gap-1">
          <li>
            <Link href={`/manuscripts/${panel.manuscriptId}`} className="underline">
              {title}
            </Link>
            <span aria-hidden> /</span>
          </li>
          <li>
            <Link href={`/figures/${figure.id}`} className="underline">
              Figure {figure.number}
            </Link>
            <span aria-hidden> /</span>
          </li>
          <li aria-current="page" className="text-ink">
            Panel {panel.letter}
          </li>
          {panel.role ? (
            <li className="ml-2">
              <RoleBadge role={panel.role} />
            </li>
          ) : null}
        </ol>
      </nav>
      <PanelEdges initial={wire(panel)}>
        <PanelWorkspace
          initial={wire(panel)}
          widthMm={panelWidthMm(figure, panel.colSpan)}
          members={members.map(({ userId, name, email, role }) => ({ userId, name, email, role }))}
          datasets={wire(datasets)}
          me={{ id: user.id, name: user.name }}
        />
      </PanelEdges>
    </>
  );
}
