// A dataset with its versions / edit its metadata (audited; never a new version).
import { withPermission } from "@/lib/http/route";
import { getDataset, updateDatasetMetadata } from "@/lib/server/datasets/read-datasets";
import { metadataPatchInput } from "@/lib/server/datasets/schemas";
import { manuscriptOfDataset } from "@/lib/server/datasets/scope";

export const GET = withPermission("manuscript.read", { scope: ({ params }) => manuscriptOfDataset(params.id) }, async ({ user, params }) =>
  getDataset(user, params.id),
);

export const PATCH = withPermission(
  "dataset.edit",
  { scope: ({ params }) => manuscriptOfDataset(params.id), body: metadataPatchInput },
  async ({ user, params, body }) => updateDatasetMetadata(user, params.id, body),
);
