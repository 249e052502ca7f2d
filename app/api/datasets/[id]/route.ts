// A dataset with its versions / edit its metadata (audited; never a new version).
import { withPermission } from "@/lib/http/route";
import { deleteForGood, manuscriptOfArchivable } from "@/lib/server/archive/archive";
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

/** The PI deletes an archived dataset nothing references, for good (409 names what still does). */
export const DELETE = withPermission("archive.delete", { scope: ({ params }) => manuscriptOfArchivable("dataset", params.id) }, async ({ user, params }) =>
  deleteForGood(user, "dataset", params.id),
);
