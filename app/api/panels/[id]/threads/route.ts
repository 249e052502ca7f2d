// Threads on a panel / start one on a revision, optionally anchored to a point or an x-range of the plot.
import { created, withPermission } from "@/lib/http/route";
import { manuscriptOfPanel } from "@/lib/server/figures/scope";
import { newThreadInput } from "@/lib/server/review/schemas";
import { createThread, listThreads } from "@/lib/server/review/threads";

export const GET = withPermission("manuscript.read", { scope: ({ params }) => manuscriptOfPanel(params.id) }, async ({ user, params }) => ({
  items: await listThreads(user, params.id),
}));

export const POST = withPermission(
  "comment.write",
  { scope: ({ params }) => manuscriptOfPanel(params.id), body: newThreadInput },
  async ({ user, params, body }) => created(await createThread(user, params.id, body)),
);
