import { CheckBundle, ImportBundle } from "@/components/export/bundle-tools";
import { PageHeader, Sheet } from "@/components/ui";
import { roleAllows } from "@/lib/authz/policy";
import { BackToManuscript, loadManuscriptPage } from "../_components/manuscript-page";

export const metadata = { title: "Bundles" };

export default async function BundlesPage({ params }: { params: Promise<{ id: string }> }) {
  const { manuscript: m } = await loadManuscriptPage(params);
  const mayImport = m.role ? roleAllows(m.role, "bundle.import") : false;
  return (
    <>
      <PageHeader title="Bundles" subtitle={<BackToManuscript manuscript={m} />} />
      <div className="space-y-6">
        <Sheet>
          <h2 className="mb-1 text-lg font-semibold">Check a bundle</h2>
          <p className="mb-4 max-w-2xl text-sm text-muted">
            A reproducibility bundle proves itself: every file is hashed again, every raw file parsed again, every fit run again and every panel drawn again
            from the bundle alone. A changed byte is named.
          </p>
          <CheckBundle />
        </Sheet>
        <Sheet>
          <h2 className="mb-1 text-lg font-semibold">Import a bundle</h2>
          {mayImport ? (
            <>
              <p className="mb-4 max-w-2xl text-sm text-muted">
                Recreates the bundle&apos;s datasets (the same bytes and hashes), its fits and its figure in this manuscript, marked with the bundle&apos;s
                hash. Its review decisions and sign-offs stay in the bundle as history: the figure is reviewed again here.
              </p>
              <ImportBundle manuscriptId={m.id} />
            </>
          ) : (
            <p className="text-sm text-muted">
              <span aria-hidden>○ </span>Only the PI and authors import bundles.
            </p>
          )}
        </Sheet>
      </div>
    </>
  );
}
