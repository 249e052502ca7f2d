import { HouseStyleForm } from "@/components/figures/house-style-form";
import { PageHeader, Sheet } from "@/components/ui";
import { roleAllows } from "@/lib/authz/policy";
import { getHouseStyle } from "@/lib/server/house-style";
import { BackToManuscript, loadManuscriptPage } from "../_components/manuscript-page";

export const metadata = { title: "House style" };

export default async function HouseStylePage({ params }: { params: Promise<{ id: string }> }) {
  const { user, id, manuscript: m } = await loadManuscriptPage(params);
  const view = await getHouseStyle(user, id);
  return (
    <>
      <PageHeader title="House style" subtitle={<BackToManuscript manuscript={m} />} />
      <Sheet>
        <p className="mb-4 max-w-2xl text-sm text-muted">
          The font, text sizes, line widths and panel letters every exported figure of this manuscript uses (SVG, PDF, PNG, TIFF and the bundle). The
          panels&apos; saved revisions are not changed, so reviews and sign-offs stand; each export records the style it used.
        </p>
        <HouseStyleForm manuscriptId={id} initial={view.style} defaults={view.defaults} editable={m.role ? roleAllows(m.role, "figure.edit") : false} />
      </Sheet>
    </>
  );
}
