"use server";
import { revalidatePath } from "next/cache";
import { withAction } from "@/lib/http/action";
import { z } from "zod";
import { resendMail } from "@/lib/server/mail/delivery";
import { deliverOutbox } from "@/lib/server/mail/outbox";
import { mailPreferencesInput, saveMailPreferences } from "@/lib/server/mail/preferences";

export const saveMailPreferencesAction = withAction("self.mail", { input: mailPreferencesInput }, async ({ user, input }) => {
  await saveMailPreferences(user, input);
  revalidatePath("/settings/mail");
  return { ok: true, message: "Saved: your mail follows these choices from now on." };
});

export const resendMailAction = withAction(
  "member.manage",
  { input: z.object({ manuscriptId: z.string().min(1).max(100), mailId: z.string().min(1).max(100) }), scope: (i) => i.manuscriptId },
  async ({ user, input }) => {
    const { to } = await resendMail(user, input.manuscriptId, input.mailId);
    void deliverOutbox().catch(() => undefined);
    revalidatePath(`/manuscripts/${input.manuscriptId}/members`);
    return { ok: true, message: `Sent again to ${to}; if it fails again it shows here.` };
  },
);
