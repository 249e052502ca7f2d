"use client";
import { saveMailPreferencesAction } from "@/app/actions/mail";
import { ActionForm } from "@/components/action-form";
import { Button } from "@/components/ui";

interface Props {
  kinds: Array<{ kind: string; label: string; on: boolean }>;
  manuscripts: Array<{ id: string; title: string; following: boolean }>;
}

const boxLook = "flex items-start gap-2 py-1 text-sm";

/** Tick what you want by mail; the whole form is saved at once. */
export function MailPreferencesForm({ kinds, manuscripts }: Props) {
  return (
    <ActionForm action={saveMailPreferencesAction} className="space-y-6">
      <fieldset>
        <legend className="mb-2 text-sm font-semibold">Notices</legend>
        {kinds.map((k) => (
          <label key={k.kind} className={boxLook}>
            <input type="checkbox" name={`kind.${k.kind}`} defaultChecked={k.on} className="mt-0.5" />
            <span>{k.label.charAt(0).toUpperCase() + k.label.slice(1)}</span>
          </label>
        ))}
      </fieldset>
      <fieldset>
        <legend className="mb-2 text-sm font-semibold">Manuscripts you follow</legend>
        {manuscripts.length === 0 ? <p className="text-sm text-muted">You are not a member of any manuscript yet.</p> : null}
        {manuscripts.map((m) => (
          <div key={m.id}>
            <input type="hidden" name={`follow-shown.${m.id}`} value="1" />
            <label className={boxLook}>
              <input type="checkbox" name={`follow.${m.id}`} defaultChecked={m.following} className="mt-0.5" />
              <span>{m.title}</span>
            </label>
          </div>
        ))}
        <p className="mt-1 text-xs text-muted">Unfollowed manuscripts send you no notices; they stay in your lists and queue.</p>
      </fieldset>
      <Button type="submit">Save mail settings</Button>
    </ActionForm>
  );
}
