"use server";
import { revalidatePath } from "next/cache";
import { redirect } from "next/navigation";
import { z } from "zod";
import { withAction } from "@/lib/http/action";
import { createManuscript, createManuscriptInput } from "@/lib/server/manuscripts";
import { changeMemberRole, changeRoleInput, inviteInput, inviteMember, removeMember } from "@/lib/server/members";

const scoped = z.object({ manuscriptId: z.string().min(1) });

export const createManuscriptAction = withAction("manuscript.create", { input: createManuscriptInput }, async ({ user, input }) => {
  const m = await createManuscript(user, input);
  redirect(`/manuscripts/${m.id}`);
});

export const inviteMemberAction = withAction(
  "member.manage",
  { input: inviteInput.extend(scoped.shape), scope: (i) => i.manuscriptId },
  async ({ user, input }) => {
    await inviteMember(user, input.manuscriptId, input);
    revalidatePath(`/manuscripts/${input.manuscriptId}/members`);
    return { ok: true, message: `Invitation sent to ${input.email}.` };
  },
);

export const changeRoleAction = withAction(
  "member.manage",
  {
    input: changeRoleInput.extend(scoped.shape).extend({ userId: z.string().min(1) }),
    scope: (i) => i.manuscriptId,
  },
  async ({ user, input }) => {
    await changeMemberRole(user, input.manuscriptId, input.userId, input);
    revalidatePath(`/manuscripts/${input.manuscriptId}/members`);
    return { ok: true, message: "Role changed." };
  },
);

export const removeMemberAction = withAction(
  "member.manage",
  {
    input: scoped.extend({ userId: z.string().min(1) }),
    scope: (i) => i.manuscriptId,
  },
  async ({ user, input }) => {
    await removeMember(user, input.manuscriptId, input.userId);
    revalidatePath(`/manuscripts/${input.manuscriptId}/members`);
    return { ok: true, message: "Member removed." };
  },
);
