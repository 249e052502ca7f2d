import Link from "next/link";
import { ArchivableFigureList } from "@/components/archive/archivable-figure-list";
import { NewFigureForm } from "@/components/figures/new-figure-form";
import { PageHeader, RoleBadge, Sheet } from "@/components/ui";
import { roleAllows } from "@/lib/authz/policy";
import { loadManuscriptPage } from "./_components/manuscript-page";

export default async function ManuscriptPage({ params }: { params: Promise<{ id: string }> }) {
  const { manuscript: m } = await loadManuscriptPage(params);
  return (
    <>
      <PageHeader
        title={m.title}
        subtitle={
          <>
            {m.labName} · your role <RoleBadge role={m.role!} />
          </>
        }
        actions={
          <>
            <Link href={`/manuscripts/${m.id}/status`} className="rounded-sm border border-rule bg-sheet px-3 py-1.5 text-sm hover:bg-paper">
              Figure status
            </Link>
            <Link href={`/manuscripts/${m.id}/activity`} className="rounded-sm border border-rule bg-sheet px-3 py-1.5 text-sm hover:bg-paper">
              Activity
            </Link>
            <Link href={`/manuscripts/${m.id}/analyses`} className="rounded-sm border border-rule bg-sheet px-3 py-1.5 text-sm hover:bg-paper">
              Analyses
            </Link>
            <Link href={`/manuscripts/${m.id}/house-style`} className="rounded-sm border border-rule bg-sheet px-3 py-1.5 text-sm hover:bg-paper">
              House style
            </Link>
            <Link href={`/manuscripts/${m.id}/bundles`} className="rounded-sm border border-rule bg-sheet px-3 py-1.5 text-sm hover:bg-paper">
              Bundles
            </Link>
            <Link href={`/manuscripts/${m.id}/members`} className="rounded-sm border border-rule bg-sheet px-3 py-1.5 text-sm hover:bg-paper">
              Members ({m.members.length})
            </Link>
          </>
        }
      />
      <div className="grid gap-6 lg:grid-cols-[1fr_280px]">
        <section aria-labelledby="figures-heading">
          <h2 id="figures-heading" className="mb-3 text-lg font-semibold">
            Figures
          </h2>
          <ArchivableFigureList manuscriptId={m.id} figures={m.figures} mayArchive={m.role ? roleAllows(m.role, "archive.manage") : false} />
          {m.role && roleAllows(m.role, "figure.edit") ? <NewFigureForm manuscriptId={m.id} /> : null}
        </section>
        <Sheet>
          <h2 className="text-sm font-semibold">Data</h2>
          <p className="mt-1 text-sm">
            <Link href={`/manuscripts/${m.id}/data`} className="text-accent underline">
              {m.datasetCount} dataset{m.datasetCount === 1 ? "" : "s"} — open the Data page →
            </Link>
          </p>
          <h2 className="mt-5 text-sm font-semibold">People</h2>
          <ul className="mt-2 space-y-1.5 text-sm">
            {m.members.map((p) => (
              <li key={p.userId} className="flex items-center justify-between gap-2">
                <span>{p.name}</span>
                <RoleBadge role={p.role} />
              </li>
            ))}
          </ul>
        </Sheet>
      </div>
    </>
  );
}
