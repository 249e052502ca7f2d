// Import a reproducibility bundle (multipart: file = the bundle's .zip) into this manuscript: it is checked in
// full first, then its datasets, fits and figure are recreated, marked imported from the bundle's hash.
import { created, withPermission } from "@/lib/http/route";
import { importUploadedBundle } from "@/lib/server/export/import-bundle";

export const POST = withPermission("bundle.import", { rawBody: true, scope: ({ params }) => params.id }, async ({ user, req, params }) =>
  created(await importUploadedBundle(user, params.id, req)),
);
