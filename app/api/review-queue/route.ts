// What waits on the caller across their manuscripts: panels to review, mentions, sign-offs.
import { withPermission } from "@/lib/http/route";
import { waitingOnMe } from "@/lib/server/review/queue";

export const GET = withPermission("self.read", {}, async ({ user }) => ({ items: await waitingOnMe(user) }));
