// Datasets of a manuscript / upload a file (multipart: file, name, metadata JSON, datasetId for a new version).
import { created, withPermission } from "@/lib/http/route";
import { listDatasets } from "@/lib/server/datasets/read-datasets";
import { uploadDataset } from "@/lib/server/datasets/upload-dataset";

export const GET = withPermission("manuscript.read", { scope: ({ params }) => params.id }, async ({ user, params }) => ({
  items: await listDatasets(user, params.id),
}));

export const POST = withPermission("dataset.upload", { scope: ({ params }) => params.id, rawBody: true }, async ({ user, params, req }) => {
  const version = await uploadDataset(user, params.id, req);
  return version.deduplicated ? Response.json(version, { status: 200 }) : created(version);
});
