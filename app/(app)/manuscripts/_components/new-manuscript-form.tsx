"use client";
import { createManuscriptAction } from "@/app/actions/manuscripts";
import { ActionForm } from "@/components/action-form";
import { Button, Field, Select, TextInput } from "@/components/ui";

export function NewManuscriptForm({ labs }: { labs: Array<{ id: string; name: string }> }) {
  return (
    <ActionForm action={createManuscriptAction} className="space-y-3">
      <Field label="Title">
        <TextInput name="title" required maxLength={300} />
      </Field>
      <Field label="Lab">
        <Select name="labId" defaultValue={labs[0]?.id}>
          {labs.map((l) => (
            <option key={l.id} value={l.id}>
              {l.name}
            </option>
          ))}
        </Select>
      </Field>
      <p className="text-xs text-muted">You become the manuscript&apos;s PI; invite the others from its members page.</p>
      <Button type="submit">Create</Button>
    </ActionForm>
  );
}
