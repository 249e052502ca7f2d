"use client";
import { ActionForm } from "@/components/action-form";
import { Button, Field, TextInput } from "@/components/ui";
import { requestLinkAction, signInWithPassword } from "@/app/actions/auth";

export function SignInForms({ next }: { next?: string }) {
  return (
    <div className="space-y-8">
      <ActionForm action={signInWithPassword} className="space-y-4" hidden={next ? { next } : undefined}>
        <Field label="E-mail">
          <TextInput name="email" type="email" autoComplete="username" required autoFocus />
        </Field>
        <Field label="Password">
          <TextInput name="password" type="password" autoComplete="current-password" required />
        </Field>
        <Button type="submit" className="w-full justify-center">
          Sign in
        </Button>
      </ActionForm>
      <div className="border-t border-rule pt-6">
        <h2 className="text-sm font-semibold">Or get a sign-in link by e-mail</h2>
        <ActionForm action={requestLinkAction} className="mt-3 flex flex-col gap-3">
          <Field label="E-mail for the link">
            <TextInput name="email" type="email" autoComplete="email" required />
          </Field>
          <Button type="submit" variant="quiet">
            E-mail me a link
          </Button>
        </ActionForm>
      </div>
    </div>
  );
}
