"use server";
import { AuthError } from "next-auth";
import { headers } from "next/headers";
import { z } from "zod";
import { signIn, signOut } from "@/auth";
import { publicAction } from "@/lib/http/action";
import { acceptInput, acceptInvitation } from "@/lib/server/members";
import { clientAddress } from "@/lib/server/limits/client-address";
import { signInBlockFor } from "@/lib/server/sign-in-limits";
import { requestSignInLink } from "@/lib/server/sign-in-links";
import { emailInput } from "@/lib/server/users";

const safeNext = (next: unknown) => (typeof next === "string" && /^\/(?!\/)/.test(next) ? next : "/manuscripts");

export const signInWithPassword = publicAction(
  z.object({ email: emailInput, password: z.string().min(1, "Enter your password."), next: z.string().optional() }),
  async ({ email, password, next }) => {
    // The limit is checked once, in the provider's authorize (auth.ts); a refusal there is an AuthError too.
    try {
      await signIn("password", { email, password, redirectTo: safeNext(next) });
    } catch (err) {
      if (err instanceof AuthError) {
        const block = await signInBlockFor(email, await headers());
        return { ok: false, message: block?.message ?? "That e-mail and password do not match an account." };
      }
      throw err;
    }
  },
);

export const requestLinkAction = publicAction(z.object({ email: emailInput }), async ({ email }) => {
  await requestSignInLink(email, clientAddress(await headers()));
  return { ok: true, message: "If the address has an account, a sign-in link is on its way. It works once, for 15 minutes." };
});

export const signInWithLinkAction = publicAction(z.object({ token: z.string().min(10) }), async ({ token }) => {
  try {
    await signIn("email-link", { token, redirectTo: "/manuscripts" });
  } catch (err) {
    if (err instanceof AuthError) return { ok: false, message: "This link is unknown, already used or expired. Ask for a new one." };
    throw err;
  }
});

export const signOutAction = publicAction(z.object({}), async () => {
  await signOut({ redirectTo: "/sign-in" });
});

export const acceptInvitationAction = publicAction(acceptInput, async (input) => {
  const { email, manuscriptId } = await acceptInvitation(input);
  if (input.password) {
    await signIn("password", { email, password: input.password, redirectTo: `/manuscripts/${manuscriptId}` });
  }
  return { ok: true, message: "Invitation accepted. Sign in to open the manuscript.", data: { manuscriptId } };
});
