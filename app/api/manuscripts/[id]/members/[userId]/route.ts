// Change a member's role / remove a member (PI only; a manuscript keeps at least one PI).
import { withPermission } from "@/lib/http/route";
import { changeMemberRole, changeRoleInput, removeMember } from "@/lib/server/members";

export const PATCH = withPermission("member.manage", { scope: ({ params }) => params.id, body: changeRoleInput }, async ({ user, params, body }) => {
  await changeMemberRole(user, params.id, params.userId, body);
  return { ok: true };
});

export const DELETE = withPermission("member.manage", { scope: ({ params }) => params.id }, async ({ user, params }) => {
  await removeMember(user, params.id, params.userId);
  return { ok: true };
});
