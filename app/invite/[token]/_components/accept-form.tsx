"use client";
import Link from "next/link";
import { acceptInvitationAction } from "@/app/actions/auth";
import { ActionForm } from "@/components/action-form";
import { Button, Field, Notice, TextInput } from "@/components/ui";

export function AcceptForm({ token, hasAccount }: { token: string; hasAccount: boolean }) {
  return (
    <ActionForm
      action={acceptInvitationAction}
      hidden={{ token }}
      className="mt-5 space-y-3"
      render={(state) =>
        state?.message ? (
          <>
            <Notice ok={state.ok}>{state.message}</Notice>
            {state.ok ? (
              <Link className="text-sm underline" href="/sign-in">
                Go to sign-in
              </Link>
            ) : null}
          </>
        ) : null
      }
    >
      {hasAccount ? (
        <p className="text-sm">You already have an account: accept, then sign in as usual.</p>
      ) : (
        <>
          <Field label="Your name">
            <TextInput name="name" required maxLength={120} autoComplete="name" />
          </Field>
          <Field label="Choose a password" hint="At least 10 characters.">
            <TextInput name="password" type="password" required minLength={10} autoComplete="new-password" />
          </Field>
        </>
      )}
      <Button type="submit">Accept invitation</Button>
    </ActionForm>
  );
}
