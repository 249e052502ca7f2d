"use client";
import { Field, TextInput } from "@/components/ui";

/** The bootstrap as typed: off, or the number of draws and the seed. */
export interface BootstrapDraft {
  on: boolean;
  draws: string;
  seed: string;
}

export const BOOTSTRAP_OFF: BootstrapDraft = { on: false, draws: "1000", seed: "1" };

/** The typed settings as options.bootstrap: undefined when off, an error naming the field otherwise. */
export function bootstrapSettings(draft: BootstrapDraft): { settings?: { draws: number; seed: number } } | { error: string } {
  if (!draft.on) return {};
  const draws = Number(draft.draws.trim());
  const seed = Number(draft.seed.trim());
  if (!Number.isInteger(draws) || draws < 100 || draws > 5000)
    return { error: `Bootstrap draws: give a whole number from 100 to 5000 (“${draft.draws}” is not).` };
  if (!Number.isInteger(seed) || seed < 0 || seed > 4294967295)
    return { error: `Bootstrap seed: give a whole number from 0 to 4294967295 (“${draft.seed}” is not).` };
  return { settings: { draws, seed } };
}

/** A switch for bootstrap intervals, with the draws and the seed that make them repeatable. */
export function BootstrapFields({ value, onChange }: { value: BootstrapDraft; onChange: (v: BootstrapDraft) => void }) {
  return (
    <fieldset className="mt-5">
      <legend className="mb-1 text-sm font-semibold">Uncertainty</legend>
      <label className="flex items-start gap-2 text-sm">
        <input type="checkbox" className="mt-0.5" checked={value.on} onChange={(e) => onChange({ ...value, on: e.target.checked })} />
        <span>
          Bootstrap intervals as well
          <span className="block text-xs text-muted">
            Refits the curve plus resampled residuals many times and gives percentile intervals beside the covariance errors, with a warning where the two
            disagree. The same seed gives the same intervals; they are stored with the run.
          </span>
        </span>
      </label>
      {value.on ? (
        <div className="mt-2 flex flex-wrap items-end gap-3">
          <div className="w-40">
            <Field label="Bootstrap draws">
              <TextInput inputMode="numeric" value={value.draws} onChange={(e) => onChange({ ...value, draws: e.target.value })} />
            </Field>
          </div>
          <div className="w-40">
            <Field label="Bootstrap seed">
              <TextInput inputMode="numeric" value={value.seed} onChange={(e) => onChange({ ...value, seed: e.target.value })} />
            </Field>
          </div>
        </div>
      ) : null}
    </fieldset>
  );
}
