// Members of a manuscript / invite someone by e-mail with a role (PI only).
import { created, withPermission } from "@/lib/http/route";
import { listMembers } from "@/lib/server/manuscripts";
import { inviteInput, inviteMember, listPendingInvitations } from "@/lib/server/members";

export const GET = withPermission("manuscript.read", { scope: ({ params }) => params.id }, async ({ user, params }) => ({
  items: await listMembers(params.id),
  invitations: await listPendingInvitations(user, params.id),
}));

export const POST = withPermission("member.manage", { scope: ({ params }) => params.id, body: inviteInput }, async ({ user, params, body }) =>
  created(await inviteMember(user, params.id, body)),
);
