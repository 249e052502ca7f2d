"use client";
import { useMutation } from "@tanstack/react-query";
import { useState, type FormEvent } from "react";
import { sendJson } from "@/components/api-client";
import { Button, Field, SaveOutcome, Select, TextInput } from "@/components/ui";
import { describeHouseStyle, HOUSE_FONTS, type HouseFont, type HouseStyle } from "@/lib/figures/house-style";

interface Saved {
  style: HouseStyle;
  summary: string;
}

const num = (s: string) => (s.trim() === "" ? NaN : Number(s));

/** The manuscript's house style as a form: every field a label, nothing typed as JSON. */
export function HouseStyleForm({
  manuscriptId,
  initial,
  defaults,
  editable,
}: {
  manuscriptId: string;
  initial: HouseStyle;
  defaults: HouseStyle;
  editable: boolean;
}) {
  const [form, setForm] = useState(() => toForm(initial));
  const [saved, setSaved] = useState(describeHouseStyle(initial));
  const save = useMutation({
    mutationFn: (style: HouseStyle) => sendJson<Saved>(`/api/manuscripts/${manuscriptId}/house-style`, "PUT", style),
    onSuccess: (r) => setSaved(r.summary),
  });
  const set = (k: keyof typeof form) => (e: { target: { value: string } }) => setForm((f) => ({ ...f, [k]: e.target.value }));

  function submit(e: FormEvent) {
    e.preventDefault();
    save.mutate(fromForm(form));
  }

  return (
    <form onSubmit={submit} aria-label="House style" className="max-w-xl space-y-4">
      <p className="text-sm" data-testid="house-style-summary">
        In use: <strong>{saved}</strong>
      </p>
      <fieldset disabled={!editable} className="space-y-3">
        <Field label="Font" hint="Shipped with the app; exports never depend on the fonts of the machine that opens them.">
          <Select value={form.font} onChange={set("font")}>
            {(Object.keys(HOUSE_FONTS) as HouseFont[]).map((f) => (
              <option key={f} value={f}>
                {HOUSE_FONTS[f].label}
              </option>
            ))}
          </Select>
        </Field>
        <div className="grid grid-cols-2 gap-3">
          <Field label="Tick and legend labels (pt)" hint="5–12 pt; journals ask for 5–7 pt at print size.">
            <TextInput type="number" step={0.5} min={5} max={12} value={form.labelPt} onChange={set("labelPt")} />
          </Field>
          <Field label="Axis titles (pt)" hint="5–14 pt">
            <TextInput type="number" step={0.5} min={5} max={14} value={form.titlePt} onChange={set("titlePt")} />
          </Field>
          <Field label="Axis line width (pt)" hint="0.25–2 pt">
            <TextInput type="number" step={0.05} min={0.25} max={2} value={form.axisLinePt} onChange={set("axisLinePt")} />
          </Field>
          <Field label="Data line width (pt)" hint="0.25–3 pt; leave empty to keep each panel's own widths.">
            <TextInput type="number" step={0.05} min={0.25} max={3} value={form.dataLinePt} onChange={set("dataLinePt")} />
          </Field>
        </div>
        <div className="grid grid-cols-3 gap-3">
          <Field label="Panel letter size (pt)" hint="6–14 pt">
            <TextInput type="number" step={0.5} min={6} max={14} value={form.letterPt} onChange={set("letterPt")} />
          </Field>
          <Field label="Panel letters">
            <Select value={form.letterCase} onChange={set("letterCase")}>
              <option value="lower">lower case (a, b)</option>
              <option value="upper">capitals (A, B)</option>
            </Select>
          </Field>
          <Field label="Letter weight">
            <Select value={form.letterWeight} onChange={set("letterWeight")}>
              <option value="bold">bold</option>
              <option value="normal">regular</option>
            </Select>
          </Field>
        </div>
      </fieldset>
      {editable ? (
        <div className="flex flex-wrap gap-2">
          <Button type="submit" disabled={save.isPending}>
            {save.isPending ? "Saving…" : "Save house style"}
          </Button>
          <Button type="button" variant="quiet" onClick={() => setForm(toForm(defaults))}>
            Back to the defaults
          </Button>
        </div>
      ) : (
        <p className="text-sm text-muted">Authors and the PI set the house style.</p>
      )}
      <SaveOutcome save={save} saved="Saved. Every export of this manuscript's figures now uses it." />
    </form>
  );
}

function toForm(s: HouseStyle) {
  return {
    font: s.font as string,
    labelPt: String(s.labelPt),
    titlePt: String(s.titlePt),
    axisLinePt: String(s.axisLinePt),
    dataLinePt: s.dataLinePt === null ? "" : String(s.dataLinePt),
    letterPt: String(s.letterPt),
    letterCase: s.letterCase as string,
    letterWeight: s.letterWeight as string,
  };
}

/** Sent as typed; the server checks each field and names the one out of range. */
function fromForm(f: ReturnType<typeof toForm>): HouseStyle {
  return {
    font: f.font as HouseFont,
    labelPt: num(f.labelPt),
    titlePt: num(f.titlePt),
    axisLinePt: num(f.axisLinePt),
    dataLinePt: f.dataLinePt.trim() === "" ? null : num(f.dataLinePt),
    letterPt: num(f.letterPt),
    letterCase: f.letterCase as HouseStyle["letterCase"],
    letterWeight: f.letterWeight as HouseStyle["letterWeight"],
  };
}
