"use server";
import { revalidatePath } from "next/cache";
import { withAction } from "@/lib/http/action";
import { mailPreferencesInput, saveMailPreferences } from "@/lib/server/mail/preferences";

export const saveMailPreferencesAction = withAction("self.mail", { input: mailPreferencesInput }, async ({ user, input }) => {
  await saveMailPreferences(user, input);
  revalidatePath("/settings/mail");
  return { ok: true, message: "Saved: your mail follows these choices from now on." };
});
