"use client";
import { useRouter } from "next/navigation";
import { useState, type FormEvent } from "react";
import { sendJson } from "@/components/api-client";
import { Button, Field, Select, TextInput } from "@/components/ui";
import { CustomWidthField, WidthPresetField, widthMmOf } from "./figure-width-field";

/** Creates a numbered figure (PI and authors) and opens it. */
export function NewFigureForm({ manuscriptId }: { manuscriptId: string }) {
  const router = useRouter();
  const [title, setTitle] = useState("");
  const [preset, setPreset] = useState<string>("double");
  const [customMm, setCustomMm] = useState("150");
  const [columns, setColumns] = useState("2");
  const [busy, setBusy] = useState(false);
  const [error, setError] = useState<string | null>(null);

  async function submit(e: FormEvent) {
    e.preventDefault();
    setError(null);
    const widthMm = widthMmOf(preset, customMm);
    if (!Number.isFinite(widthMm) || widthMm < 30 || widthMm > 300) return setError("Width: give a number of millimetres between 30 and 300.");
    setBusy(true);
    try {
      const f = await sendJson<{ id: string }>("/api/figures", "POST", { manuscriptId, title, widthMm, columns: Number(columns) });
      router.push(`/figures/${f.id}`);
    } catch (err) {
      setError((err as Error).message);
      setBusy(false);
    }
  }

  return (
    <form onSubmit={(e) => void submit(e)} aria-label="New figure" className="mt-4 rounded-sm border border-rule bg-sheet p-4">
      <h3 className="mb-3 text-sm font-semibold">New figure</h3>
      <div className="grid gap-3 sm:grid-cols-[minmax(0,2fr)_minmax(0,1.4fr)_minmax(0,0.6fr)]">
        <Field label="Title">
          <TextInput required value={title} onChange={(e) => setTitle(e.target.value)} placeholder="e.g. T₂ across the sample series" />
        </Field>
        <WidthPresetField value={preset} onChange={setPreset} />
        <Field label="Columns">
          <Select value={columns} onChange={(e) => setColumns(e.target.value)}>
            {[1, 2, 3, 4].map((n) => (
              <option key={n}>{n}</option>
            ))}
          </Select>
        </Field>
      </div>
      {preset === "custom" ? (
        <div className="mt-3 w-40">
          <CustomWidthField value={customMm} onChange={setCustomMm} />
        </div>
      ) : null}
      {error ? (
        <p role="alert" className="mt-2 text-sm text-bad">
          <span aria-hidden>✕ </span>
          {error}
        </p>
      ) : null}
      <Button type="submit" className="mt-3" disabled={busy}>
        {busy ? "Creating…" : "Create figure"}
      </Button>
    </form>
  );
}
