"use client";
import { useMutation, useQueryClient } from "@tanstack/react-query";
import { useState, type FormEvent } from "react";
import { sendJson } from "@/components/api-client";
import { queryKeys, type FigureView, type MemberView } from "@/components/figures/api";
import { CustomWidthField, presetFor, WidthPresetField, widthMmOf } from "@/components/figures/figure-width-field";
import { Button, Field, SaveOutcome, Select, TextInput } from "@/components/ui";
import { roleAllows } from "@/lib/authz/policy";

/** Title, width, maximum height, columns and required reviewers (PI and authors change them). */
export function FigureSettings({ figure, members, editable }: { figure: FigureView; members: MemberView[]; editable: boolean }) {
  const qc = useQueryClient();
  const [title, setTitle] = useState(figure.title);
  const [preset, setPreset] = useState(presetFor(figure.widthMm));
  const [customMm, setCustomMm] = useState(String(figure.widthMm));
  const [maxHeight, setMaxHeight] = useState(String(figure.maxHeightMm));
  const [columns, setColumns] = useState(String(figure.columns));
  const [reviewers, setReviewers] = useState<string[]>(figure.requiredReviewers);
  const [shareYTitles, setShareYTitles] = useState(figure.shareYTitles);
  const save = useMutation({
    mutationFn: (patch: Record<string, unknown>) => sendJson<FigureView>(`/api/figures/${figure.id}`, "PATCH", patch),
    onSuccess: (f) => qc.setQueryData(queryKeys.figure(figure.id), f),
  });
  const candidates = members.filter((m) => roleAllows(m.role, "review.decide"));
  const name = (id: string) => members.find((m) => m.userId === id)?.name ?? id;

  if (!editable) {
    return (
      <dl className="grid grid-cols-[auto_1fr] gap-x-3 gap-y-1 text-sm">
        <dt className="text-muted">Width</dt>
        <dd className="tabular">{figure.widthMm} mm</dd>
        <dt className="text-muted">Max height</dt>
        <dd className="tabular">{figure.maxHeightMm} mm</dd>
        <dt className="text-muted">Columns</dt>
        <dd>{figure.columns}</dd>
        <dt className="text-muted">Y-axis titles</dt>
        <dd>{figure.shareYTitles ? "one per row" : "on every panel"}</dd>
        <dt className="text-muted">Reviewers</dt>
        <dd>{figure.requiredReviewers.length ? figure.requiredReviewers.map(name).join(", ") : "any one approval"}</dd>
      </dl>
    );
  }

  function submit(e: FormEvent) {
    e.preventDefault();
    const widthMm = widthMmOf(preset, customMm);
    save.mutate({ title, widthMm, maxHeightMm: Number(maxHeight), columns: Number(columns), shareYTitles, requiredReviewers: reviewers });
  }

  return (
    <form onSubmit={submit} aria-label="Figure settings" className="space-y-3">
      <Field label="Title">
        <TextInput required value={title} onChange={(e) => setTitle(e.target.value)} />
      </Field>
      <WidthPresetField value={preset} onChange={setPreset} />
      {preset === "custom" ? <CustomWidthField value={customMm} onChange={setCustomMm} /> : null}
      <div className="grid grid-cols-2 gap-3">
        <Field label="Max height (mm)">
          <TextInput type="number" min={30} max={300} value={maxHeight} onChange={(e) => setMaxHeight(e.target.value)} />
        </Field>
        <Field label="Columns">
          <Select value={columns} onChange={(e) => setColumns(e.target.value)}>
            {[1, 2, 3, 4, 5, 6].map((n) => (
              <option key={n}>{n}</option>
            ))}
          </Select>
        </Field>
      </div>
      <label className="flex items-start gap-2 text-sm">
        <input type="checkbox" className="mt-0.5 h-4 w-4 accent-accent" checked={shareYTitles} onChange={(e) => setShareYTitles(e.target.checked)} />
        <span>
          One y-axis title per row
          <span className="block text-xs text-muted">Later panels of a row whose y title repeats the first panel&apos;s leave it out when drawn.</span>
        </span>
      </label>
      <fieldset className="text-sm">
        <legend className="mb-1 font-medium">Required reviewers</legend>
        <p className="mb-1 text-xs text-muted">With none chosen, one approval by anyone completes a panel.</p>
        {candidates.map((m) => (
          <label key={m.userId} className="flex items-center gap-2 py-0.5">
            <input
              type="checkbox"
              className="h-4 w-4 accent-accent"
              checked={reviewers.includes(m.userId)}
              onChange={(e) => setReviewers((r) => (e.target.checked ? [...r, m.userId] : r.filter((x) => x !== m.userId)))}
            />
            {m.name} <span className="text-xs text-muted">({m.role === "pi" ? "PI" : m.role})</span>
          </label>
        ))}
      </fieldset>
      <Button type="submit" disabled={save.isPending}>
        {save.isPending ? "Saving…" : "Save settings"}
      </Button>
      <SaveOutcome save={save} />
    </form>
  );
}
