import Link from "next/link";
import { CopyButton } from "@/components/data/copy-button";
import { DatasetsTable } from "@/components/data/datasets-table";
import { UploadDropZone } from "@/components/data/upload-drop-zone";
import { PageHeader, Sheet } from "@/components/ui";
import { roleAllows } from "@/lib/authz/policy";
import { env } from "@/lib/env";
import { listDatasets } from "@/lib/server/datasets/read-datasets";
import { BackToManuscript, loadManuscriptPage } from "../_components/manuscript-page";

export const metadata = { title: "Data" };

export default async function ManuscriptDataPage({ params }: { params: Promise<{ id: string }> }) {
  const { user, id, manuscript: m } = await loadManuscriptPage(params);
  const items = await listDatasets(user, id);
  const mayUpload = m.role ? roleAllows(m.role, "dataset.upload") : false;
  const curl = `curl -H "Authorization: Bearer $TOKEN" -F file=@echo.csv -F name="Hahn echo NV03" ${env().appUrl}/api/manuscripts/${m.id}/datasets`;
  return (
    <>
      <PageHeader title="Data" subtitle={<BackToManuscript manuscript={m} />} />
      <div className="space-y-6">
        {mayUpload ? (
          <Sheet>
            <h2 className="mb-3 text-sm font-semibold">Upload measurement files</h2>
            <UploadDropZone manuscriptId={m.id} />
          </Sheet>
        ) : (
          <Sheet>
            <p className="text-sm text-muted">
              <span aria-hidden>○ </span>You can look at every dataset and download the original files. Only the PI and authors upload data.
            </p>
          </Sheet>
        )}
        <section aria-labelledby="datasets-heading">
          <h2 id="datasets-heading" className="mb-2 text-lg font-semibold">
            Datasets
          </h2>
          <DatasetsTable manuscriptId={m.id} initial={items} mayArchive={m.role ? roleAllows(m.role, "archive.manage") : false} />
        </section>
        {mayUpload ? (
          <Sheet>
            <h2 className="text-sm font-semibold">From a script</h2>
            <p className="mt-1 text-sm text-muted">
              Create a token on the{" "}
              <Link href="/settings/tokens" className="underline">
                API tokens
              </Link>{" "}
              page, then send each file as multipart. Add <code className="font-mono text-xs">-F datasetId=…</code> to store a new version of an existing
              dataset.
            </p>
            <div className="mt-3 flex items-start gap-2">
              <pre
                className="min-w-0 flex-1 whitespace-pre-wrap break-all rounded-sm border border-rule bg-paper px-3 py-2 font-mono text-xs"
                data-testid="curl-line"
              >
                {curl}
              </pre>
              <CopyButton value={curl} label="Copy the curl command" />
            </div>
          </Sheet>
        ) : null}
      </div>
    </>
  );
}
