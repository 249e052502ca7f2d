"use client";
import { createTokenAction, revokeTokenAction } from "@/app/actions/tokens";
import { ActionForm } from "@/components/action-form";
import { Button, Field, Notice, TextInput } from "@/components/ui";

export function NewTokenForm() {
  return (
    <ActionForm
      action={createTokenAction}
      className="space-y-3"
      render={(state) => (
        <>
          {state?.message ? <Notice ok={state.ok}>{state.message}</Notice> : null}
          {state?.ok && (state.data as { token?: string })?.token ? (
            <output data-testid="new-token" className="block break-all rounded-sm border border-rule bg-paper p-2 font-mono text-xs">
              {(state.data as { token: string }).token}
            </output>
          ) : null}
        </>
      )}
    >
      <Field label="Name" hint="Say where it is used, e.g. “confocal PC, room 2.14”.">
        <TextInput name="name" required maxLength={80} />
      </Field>
      <Button type="submit">Create token</Button>
    </ActionForm>
  );
}

export function RevokeTokenButton({ tokenId, name }: { tokenId: string; name: string }) {
  return (
    <ActionForm action={revokeTokenAction} hidden={{ tokenId }}>
      <Button type="submit" variant="danger" aria-label={`Revoke ${name}`}>
        Revoke
      </Button>
    </ActionForm>
  );
}
