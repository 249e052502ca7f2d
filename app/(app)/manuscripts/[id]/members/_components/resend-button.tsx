"use client";
import { resendMailAction } from "@/app/actions/mail";
import { ActionForm } from "@/components/action-form";
import { Button } from "@/components/ui";

export function ResendButton({ manuscriptId, mailId }: { manuscriptId: string; mailId: string }) {
  return (
    <ActionForm action={resendMailAction} hidden={{ manuscriptId, mailId }}>
      <Button type="submit" variant="quiet">
        Send again
      </Button>
    </ActionForm>
  );
}
