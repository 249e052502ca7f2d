"use client";
import { Button, Field, TextInput } from "@/components/ui";

/** The fit window as typed: both blank for the whole range. */
export interface WindowDraft {
  from: string;
  to: string;
}

export const NO_WINDOW: WindowDraft = { from: "", to: "" };

/** The typed window as options.xRange: undefined when both fields are blank, an error naming the field otherwise. */
export function windowRange(draft: WindowDraft): { range?: [number, number] } | { error: string } {
  const from = draft.from.trim();
  const to = draft.to.trim();
  if (!from && !to) return {};
  if (!from || !to) return { error: `Fit window: give both “Fit from” and “Fit to” (or leave both blank for every point).` };
  const lo = Number(from);
  const hi = Number(to);
  if (!Number.isFinite(lo)) return { error: `Fit from: “${from}” is not a number.` };
  if (!Number.isFinite(hi)) return { error: `Fit to: “${to}” is not a number.` };
  if (!(lo < hi)) return { error: "Fit window: “Fit from” must be below “Fit to”." };
  return { range: [lo, hi] };
}

/** A window as the typed fields show it. */
export const windowDraft = (range: readonly [number, number] | null | undefined): WindowDraft =>
  range ? { from: String(range[0]), to: String(range[1]) } : NO_WINDOW;

/** “Fit from” / “to” in the x column's unit; the window can also be drawn on the plot by dragging. */
export function FitWindowFields({ value, unit, onChange }: { value: WindowDraft; unit: string | null; onChange: (v: WindowDraft) => void }) {
  const u = unit ? ` (${unit})` : "";
  return (
    <fieldset className="mt-5">
      <legend className="mb-1 text-sm font-semibold">Fit window</legend>
      <p className="mb-2 text-xs text-muted">
        Fit only the points with x in this range, or drag across the plot after a fit. Blank: every point. The window is stored with the run.
      </p>
      <div className="flex flex-wrap items-end gap-3">
        <div className="w-40">
          <Field label={`Fit from${u}`}>
            <TextInput inputMode="decimal" value={value.from} onChange={(e) => onChange({ ...value, from: e.target.value })} />
          </Field>
        </div>
        <div className="w-40">
          <Field label={`Fit to${u}`}>
            <TextInput inputMode="decimal" value={value.to} onChange={(e) => onChange({ ...value, to: e.target.value })} />
          </Field>
        </div>
        <Button type="button" variant="quiet" onClick={() => onChange(NO_WINDOW)} disabled={!value.from && !value.to}>
          Whole range
        </Button>
      </div>
    </fieldset>
  );
}
