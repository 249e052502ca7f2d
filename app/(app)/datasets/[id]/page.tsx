import Link from "next/link";
import { ColumnSummaryTable } from "@/components/data/column-summary-table";
import { kindLabel } from "@/components/data/measurement-kinds";
import { MetadataPanel } from "@/components/data/metadata-panel";
import { QuickPlotPanel } from "@/components/data/quick-plot-panel";
import { RowsPreview } from "@/components/data/rows-preview";
import { UploadDropZone } from "@/components/data/upload-drop-zone";
import { VersionHeader } from "@/components/data/version-header";
import { VersionsTable } from "@/components/data/versions-table";
import { EmptyState, PageHeader, RoleBadge, Sheet } from "@/components/ui";
import { ArchivedPageBanner, ArchivePageButton } from "@/components/archive/archive-controls";
import { roleAllows } from "@/lib/authz/policy";
import { loadOrNotFound, requireUser } from "@/lib/http/session";
import { getDataset } from "@/lib/server/datasets/read-datasets";
import { getManuscriptTitle } from "@/lib/server/manuscripts";

export const metadata = { title: "Dataset" };

export default async function DatasetPage({ params, searchParams }: { params: Promise<{ id: string }>; searchParams: Promise<{ v?: string | string[] }> }) {
  const user = await requireUser();
  const { id } = await params;
  const { v } = await searchParams;
  const d = await loadOrNotFound(() => getDataset(user, id));
  const manuscriptTitle = await getManuscriptTitle(d.manuscriptId);
  const editable = d.role ? roleAllows(d.role, "dataset.edit") : false;
  const selected = d.versions.find((x) => x.id === v) ?? d.versions[0];
  const dataHref = `/manuscripts/${d.manuscriptId}/data`;

  return (
    <>
      <nav aria-label="Breadcrumb" className="mb-2 text-sm text-muted">
        <ol className="flex flex-wrap gap-1">
          <li>
            <Link href={`/manuscripts/${d.manuscriptId}`} className="underline">
              {manuscriptTitle}
            </Link>
            <span aria-hidden> /</span>
          </li>
          <li>
            <Link href={dataHref} className="underline">
              Data
            </Link>
            <span aria-hidden> /</span>
          </li>
          <li aria-current="page" className="text-ink">
            {d.name}
          </li>
        </ol>
      </nav>
      {d.archivedAt ? (
        <ArchivedPageBanner
          kind="dataset"
          id={d.id}
          archivedAt={d.archivedAt}
          canRestore={roleAllows(d.role, "archive.manage")}
          canDelete={roleAllows(d.role, "archive.delete")}
          afterDelete={dataHref}
        />
      ) : null}
      <PageHeader
        actions={!d.archivedAt && roleAllows(d.role, "archive.manage") ? <ArchivePageButton kind="dataset" id={d.id} /> : undefined}
        title={d.name}
        subtitle={
          <>
            {kindLabel(d.kind)} · {d.versions.length} version{d.versions.length === 1 ? "" : "s"} · your role <RoleBadge role={d.role!} />
          </>
        }
      />
      <div className="grid grid-cols-1 gap-6 lg:grid-cols-[minmax(0,1fr)_300px]">
        <div className="min-w-0 space-y-6">
          <section aria-labelledby="versions-heading">
            <h2 id="versions-heading" className="mb-2 text-lg font-semibold">
              Versions
            </h2>
            <VersionsTable datasetId={d.id} versions={d.versions} selectedId={selected?.id} />
          </section>
          {selected ? (
            <section aria-labelledby="version-heading" className="space-y-6" key={selected.id}>
              <VersionHeader version={selected} latest={selected.id === d.versions[0]?.id} />
              <p className="text-sm">
                <Link href={`/versions/${selected.id}/fit`} className="underline">
                  Fit this version →
                </Link>
              </p>
              <Sheet>
                <h3 className="mb-3 text-sm font-semibold">Quick plot</h3>
                <QuickPlotPanel version={selected} kind={d.kind} />
              </Sheet>
              <div>
                <h3 className="mb-2 text-sm font-semibold">Column summary</h3>
                <ColumnSummaryTable version={selected} />
              </div>
              <div>
                <h3 className="mb-2 text-sm font-semibold">Rows</h3>
                <RowsPreview version={selected} />
              </div>
            </section>
          ) : (
            <EmptyState title="No versions">This dataset has no stored file.</EmptyState>
          )}
        </div>
        <aside className="order-first space-y-6 lg:order-none">
          <Sheet>
            <h2 className="mb-3 text-sm font-semibold">Details</h2>
            <MetadataPanel
              datasetId={d.id}
              initial={{ kind: d.kind, sample: d.sample, instrument: d.instrument, measuredAt: d.measuredAt, notes: d.notes, tags: d.tags }}
              editable={editable}
            />
          </Sheet>
          {editable ? (
            <Sheet>
              <h2 className="mb-1 text-sm font-semibold">Upload a new version</h2>
              <p className="mb-3 text-xs text-muted">The versions above stay as they are; the new file becomes version {(d.versions[0]?.number ?? 0) + 1}.</p>
              <UploadDropZone manuscriptId={d.manuscriptId} datasetId={d.id} />
            </Sheet>
          ) : null}
          <p className="text-xs text-muted">
            <Link href={dataHref} className="underline">
              ← All datasets of this manuscript
            </Link>
          </p>
        </aside>
      </div>
    </>
  );
}
