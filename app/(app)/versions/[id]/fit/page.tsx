import Link from "next/link";
import { FitWorkbench } from "@/components/analysis/fit-workbench";
import { EstimateCaution } from "@/components/analysis/estimate-caution";
import { PageHeader, RoleBadge } from "@/components/ui";
import { roleAllows } from "@/lib/authz/policy";
import { loadOrNotFound, requireUser } from "@/lib/http/session";
import { safeReturnTo } from "@/lib/figures/return-to";
import { analysisCatalogue } from "@/lib/server/analyses/catalogue";
import { listAnalysesForVersion } from "@/lib/server/analyses/run-analysis";
import { getDataset, getVersion } from "@/lib/server/datasets/read-datasets";

export const metadata = { title: "Fit" };

export default async function FitPage({ params, searchParams }: { params: Promise<{ id: string }>; searchParams: Promise<{ returnTo?: string | string[] }> }) {
  const user = await requireUser();
  const { id } = await params;
  const asked = (await searchParams).returnTo;
  const returnTo = safeReturnTo(Array.isArray(asked) ? asked[0] : asked);
  const version = await loadOrNotFound(() => getVersion(user, id));
  const dataset = await loadOrNotFound(() => getDataset(user, version.datasetId));
  const runs = await listAnalysesForVersion(user, id);
  const mayRun = dataset.role ? roleAllows(dataset.role, "analysis.run") : false;
  const latest = dataset.versions[0]?.number ?? version.number;
  return (
    <>
      <PageHeader
        title={`Fit · ${dataset.name}`}
        subtitle={
          <>
            <Link href={`/datasets/${dataset.id}`} className="underline">
              ← {dataset.name}
            </Link>{" "}
            · version {version.number}
            {version.number < latest ? <> (not the newest: version {latest} exists)</> : null} · {version.rowCount} rows{" "}
            {dataset.role ? (
              <>
                · your role <RoleBadge role={dataset.role} />
              </>
            ) : null}
          </>
        }
        actions={
          <>
            <Link
              href={`/manuscripts/${dataset.manuscriptId}/analyses#global-fit`}
              className="rounded-sm border border-rule bg-sheet px-3 py-1.5 text-sm hover:bg-paper"
            >
              Global fit over several datasets
            </Link>
            <Link href={`/manuscripts/${dataset.manuscriptId}/analyses`} className="rounded-sm border border-rule bg-sheet px-3 py-1.5 text-sm hover:bg-paper">
              Batch fits and statistics
            </Link>
          </>
        }
      />
      <EstimateCaution />
      <FitWorkbench
        versionId={version.id}
        kind={dataset.kind}
        columns={version.columns}
        models={analysisCatalogue().items}
        mayRun={mayRun}
        initialRuns={runs}
        returnTo={returnTo}
      />
    </>
  );
}
