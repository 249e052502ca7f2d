// The manuscript's audit log, in words.
import { withPermission } from "@/lib/http/route";
import { manuscriptActivity } from "@/lib/server/review/activity";

export const GET = withPermission("manuscript.read", { scope: ({ params }) => params.id }, async ({ user, params }) => ({
  items: await manuscriptActivity(user, params.id),
}));
