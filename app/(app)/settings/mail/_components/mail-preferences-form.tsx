"use client";
import { useSyncExternalStore } from "react";
import { saveMailPreferencesAction } from "@/app/actions/mail";
import { ActionForm } from "@/components/action-form";
import { Button, Field, Select } from "@/components/ui";

interface Props {
  kinds: Array<{ kind: string; label: string; on: boolean }>;
  manuscripts: Array<{ id: string; title: string; following: boolean; figures: Array<{ id: string; label: string; following: boolean }> }>;
  digest: { frequency: "off" | "daily" | "weekly"; hour: number; timeZone: string | null };
  timeZones: string[];
}

const FREQUENCIES = [
  { value: "daily", label: "Daily, Monday to Friday" },
  { value: "weekly", label: "Weekly, on Mondays" },
  { value: "off", label: "Off" },
] as const;
const hh = (h: number) => `${String(h).padStart(2, "0")}:00`;
const never = () => () => undefined;
const browserZone = () => Intl.DateTimeFormat().resolvedOptions().timeZone;

const boxLook = "flex items-start gap-2 py-1 text-sm";

/** Tick what you want by mail; the whole form is saved at once. */
export function MailPreferencesForm({ kinds, manuscripts, digest, timeZones }: Props) {
  // Never chosen: propose the browser's own zone (the server renders UTC; the browser's render after hydration proposes its zone).
  const browser = useSyncExternalStore(never, browserZone, () => null);
  const proposed = digest.timeZone ?? (browser && timeZones.includes(browser) ? browser : "UTC");
  return (
    <ActionForm action={saveMailPreferencesAction} className="space-y-6">
      <fieldset>
        <legend className="mb-2 text-sm font-semibold">Digest</legend>
        <p className="mb-2 text-xs text-muted">
          What happened on the manuscripts you follow since the last digest, by manuscript and figure, each line a link. Nothing new, no mail.
        </p>
        {FREQUENCIES.map((f) => (
          <label key={f.value} className={boxLook}>
            <input type="radio" name="digest" value={f.value} defaultChecked={digest.frequency === f.value} className="mt-0.5" />
            <span>{f.label}</span>
          </label>
        ))}
        <div className="mt-2 grid gap-3 sm:grid-cols-2">
          <Field label="At">
            <Select name="digestHour" defaultValue={String(digest.hour)}>
              {Array.from({ length: 24 }, (_, h) => (
                <option key={h} value={h}>
                  {hh(h)}
                </option>
              ))}
            </Select>
          </Field>
          <Field label="Time zone" hint={digest.timeZone ? undefined : "Proposed from your browser; saved when you save."}>
            <Select key={proposed} name="timeZone" defaultValue={proposed}>
              {timeZones.map((z) => (
                <option key={z} value={z}>
                  {z}
                </option>
              ))}
            </Select>
          </Field>
        </div>
      </fieldset>
      <fieldset>
        <legend className="mb-2 text-sm font-semibold">Notices as they happen</legend>
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
            {m.figures.length ? (
              <ul className="mb-2 ml-6" aria-label={`Figures of ${m.title}`}>
                {m.figures.map((f) => (
                  <li key={f.id}>
                    <input type="hidden" name={`figure-shown.${f.id}`} value="1" />
                    <label className={boxLook}>
                      <input type="checkbox" name={`figure.${f.id}`} defaultChecked={f.following} className="mt-0.5" />
                      <span>{f.label}</span>
                    </label>
                  </li>
                ))}
              </ul>
            ) : null}
          </div>
        ))}
        <p className="mt-1 text-xs text-muted">
          Unfollowed manuscripts and figures send you no notices and leave your digest; they stay in your lists and queue. Each thread has its own “Mail me
          replies” switch.
        </p>
      </fieldset>
      <Button type="submit">Save mail settings</Button>
    </ActionForm>
  );
}
