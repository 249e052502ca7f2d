// Datasets of a manuscript (`?archived=1`: the archived ones) / upload a file (multipart: file, name, metadata JSON, datasetId for a new version).
import { archivedQuery } from "@/lib/server/archive/archive";
import { created, withPermission } from "@/lib/http/route";
import { listDatasets } from "@/lib/server/datasets/read-datasets";
import { uploadDataset } from "@/lib/server/datasets/upload-dataset";

export const GET = withPermission("manuscript.read", { scope: ({ params }) => params.id, query: archivedQuery }, async ({ user, params, query }) => ({
  items: await listDatasets(user, params.id, query.archived === "1"),
}));

export const POST = withPermission("dataset.upload", { scope: ({ params }) => params.id, rawBody: true }, async ({ user, params, req }) => {
  const version = await uploadDataset(user, params.id, req);
  return version.deduplicated ? Response.json(version, { status: 200 }) : created(version);
});
