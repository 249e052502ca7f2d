// The caller and their memberships.
import { withPermission } from "@/lib/http/route";
import { labMembershipsForUser, membershipsForUser } from "@/lib/server/manuscripts";

export const GET = withPermission("self.read", {}, async ({ user }) => ({
  ...user,
  memberships: await membershipsForUser(user.id),
  labs: await labMembershipsForUser(user.id),
}));
