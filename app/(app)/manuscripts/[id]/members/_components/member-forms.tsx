"use client";
import { changeRoleAction, inviteMemberAction, removeMemberAction } from "@/app/actions/manuscripts";
import { ActionForm } from "@/components/action-form";
import { Button, Field, Select, TextInput } from "@/components/ui";
import type { Role } from "@/db/schema";

const ROLE_OPTIONS: Array<[Role, string]> = [
  ["pi", "PI"],
  ["author", "Author"],
  ["reviewer", "Reviewer"],
  ["viewer", "Viewer"],
];

export function InviteForm({ manuscriptId }: { manuscriptId: string }) {
  return (
    <ActionForm action={inviteMemberAction} hidden={{ manuscriptId }} className="space-y-3">
      <Field label="E-mail">
        <TextInput name="email" type="email" required />
      </Field>
      <Field label="Role" hint="Reviewers comment and approve; viewers only look and export.">
        <Select name="role" defaultValue="reviewer">
          {ROLE_OPTIONS.map(([v, l]) => (
            <option key={v} value={v}>
              {l}
            </option>
          ))}
        </Select>
      </Field>
      <Button type="submit">Send invitation</Button>
    </ActionForm>
  );
}

export function MemberControls({ manuscriptId, userId, role, name }: { manuscriptId: string; userId: string; role: Role; name: string }) {
  return (
    <div className="flex flex-wrap items-start gap-2">
      <ActionForm action={changeRoleAction} hidden={{ manuscriptId, userId }} className="flex items-center gap-1">
        <label className="sr-only" htmlFor={`role-${userId}`}>
          Role of {name}
        </label>
        <Select id={`role-${userId}`} name="role" defaultValue={role}>
          {ROLE_OPTIONS.map(([v, l]) => (
            <option key={v} value={v}>
              {l}
            </option>
          ))}
        </Select>
        <Button type="submit" variant="quiet">
          Change
        </Button>
      </ActionForm>
      <ActionForm action={removeMemberAction} hidden={{ manuscriptId, userId }}>
        <Button type="submit" variant="danger" aria-label={`Remove ${name}`}>
          Remove
        </Button>
      </ActionForm>
    </div>
  );
}
