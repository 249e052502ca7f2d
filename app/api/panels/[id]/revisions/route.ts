// A panel's revisions / a new revision (spec + bindings); 409 when baseRevisionId is not the current one.
import { SPEC_BODY_MAX_BYTES } from "@/lib/http/read-json-body";
import { created, withPermission } from "@/lib/http/route";
import { createRevision, listRevisions } from "@/lib/server/figures/revisions";
import { revisionInput } from "@/lib/server/figures/schemas";
import { manuscriptOfPanel } from "@/lib/server/figures/scope";

export const GET = withPermission("manuscript.read", { scope: ({ params }) => manuscriptOfPanel(params.id) }, async ({ user, params }) => ({
  items: await listRevisions(user, params.id),
}));

export const POST = withPermission(
  "figure.edit",
  { scope: ({ params }) => manuscriptOfPanel(params.id), body: revisionInput, maxBodyBytes: SPEC_BODY_MAX_BYTES },
  async ({ user, params, body }) => created(await createRevision(user, params.id, body)),
);
