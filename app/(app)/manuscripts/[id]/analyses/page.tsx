import { AnalysesWorkspace } from "@/components/analysis/analyses-workspace";
import { DecouplingScaling } from "@/components/analysis/decoupling-scaling";
import type { BatchDataset } from "@/components/analysis/batch-types";
import { EstimateCaution } from "@/components/analysis/estimate-caution";
import { PageHeader, Sheet } from "@/components/ui";
import { roleAllows } from "@/lib/authz/policy";
import { analysisCatalogue } from "@/lib/server/analyses/catalogue";
import { scalingCandidates } from "@/lib/server/analyses/scaling";
import { listDatasets } from "@/lib/server/datasets/read-datasets";
import { BackToManuscript, loadManuscriptPage } from "../_components/manuscript-page";

export const metadata = { title: "Analyses" };

/** Tags the service writes on derived datasets; they say where a fit came from, not how to group centres. */
const DERIVED_TAGS = new Set(["derivedFrom", "model"]);

export default async function AnalysesPage({ params }: { params: Promise<{ id: string }> }) {
  const { user, id, manuscript: m } = await loadManuscriptPage(params);
  const all = await listDatasets(user, id);
  const sources: BatchDataset[] = all
    .filter((d) => !d.tags.derivedFrom && d.latestVersion)
    .map((d) => ({
      id: d.id,
      name: d.name,
      kind: d.kind,
      sample: d.sample,
      instrument: d.instrument,
      tags: d.tags,
      versionId: d.latestVersion!.id,
      versionNumber: d.latestVersion!.number,
      columns: d.latestVersion!.columns,
    }));
  const tagKeys = [...new Set(sources.flatMap((d) => Object.keys(d.tags)))].filter((k) => !DERIVED_TAGS.has(k)).sort();
  const groupings = [...tagKeys, ...["kind", "sample", "instrument"].filter((k) => !tagKeys.includes(k))];
  const mayRun = m.role ? roleAllows(m.role, "analysis.run") : false;
  return (
    <>
      <PageHeader title="Analyses" subtitle={<BackToManuscript manuscript={m} />} />
      <EstimateCaution />
      <AnalysesWorkspace manuscriptId={m.id} datasets={sources} models={analysisCatalogue().items} groupings={groupings} mayRun={mayRun} />
      <section aria-labelledby="scaling-heading" className="mt-6">
        <Sheet>
          <h2 id="scaling-heading" className="mb-3 text-lg font-semibold">
            Decoupling scaling
          </h2>
          <DecouplingScaling manuscriptId={m.id} candidates={await scalingCandidates(user, id)} mayRun={mayRun} />
        </Sheet>
      </section>
    </>
  );
}
