"use client";
import { useMutation } from "@tanstack/react-query";
import { useRouter } from "next/navigation";
import { useState, type FormEvent, type ReactNode } from "react";
import { sendJson } from "@/components/api-client";
import { Button, Field, Notice, Select, TextInput } from "@/components/ui";
import type { DatasetDetail } from "./api";
import { formatTags, parseTags } from "./format";
import { KIND_OPTIONS } from "./measurement-kinds";

type Metadata = Pick<DatasetDetail, "kind" | "sample" | "instrument" | "measuredAt" | "notes" | "tags">;

function MetadataList({ d }: { d: Metadata }) {
  const rows: Array<[string, ReactNode]> = [
    ["Sample", d.sample],
    ["Instrument", d.instrument],
    ["Measured", d.measuredAt],
    ["Notes", d.notes],
    [
      "Tags",
      Object.keys(d.tags ?? {}).length ? (
        <ul className="flex flex-wrap gap-1">
          {Object.entries(d.tags).map(([k, v]) => (
            <li key={k} className="rounded-sm border border-rule bg-paper px-1.5 py-px text-xs">
              {k}={v}
            </li>
          ))}
        </ul>
      ) : null,
    ],
  ];
  return (
    <dl className="grid grid-cols-[6.5rem_1fr] gap-x-3 gap-y-2 text-sm">
      {rows.map(([label, value]) => (
        <div key={label} className="contents">
          <dt className="text-muted">{label}</dt>
          <dd className="min-w-0 whitespace-pre-line break-words">{value || <span className="text-muted">—</span>}</dd>
        </div>
      ))}
    </dl>
  );
}

const blankToNull = (s: string) => (s.trim() ? s.trim() : null);

/** The dataset's description. Editing it is audited and never makes a new version. */
export function MetadataPanel({ datasetId, initial, editable }: { datasetId: string; initial: Metadata; editable: boolean }) {
  const router = useRouter();
  const [editing, setEditing] = useState(false);
  const [form, setForm] = useState({
    kind: initial.kind,
    sample: initial.sample ?? "",
    instrument: initial.instrument ?? "",
    measuredAt: initial.measuredAt ?? "",
    notes: initial.notes ?? "",
    tags: formatTags(initial.tags),
  });
  const tagResult = parseTags(form.tags);
  const save = useMutation({
    mutationFn: () =>
      sendJson(`/api/datasets/${datasetId}`, "PATCH", {
        kind: form.kind,
        sample: blankToNull(form.sample),
        instrument: blankToNull(form.instrument),
        measuredAt: blankToNull(form.measuredAt),
        notes: blankToNull(form.notes),
        tags: tagResult.tags,
      }),
    onSuccess: () => {
      setEditing(false);
      router.refresh();
    },
  });
  const set = (key: keyof typeof form) => (e: { target: { value: string } }) => setForm({ ...form, [key]: e.target.value });
  const submit = (e: FormEvent) => {
    e.preventDefault();
    if (!tagResult.error) save.mutate();
  };

  if (!editing) {
    return (
      <div>
        <MetadataList d={initial} />
        {save.isSuccess ? <Notice ok>Saved. The change is in the audit log; the stored versions are untouched.</Notice> : null}
        {editable ? (
          <Button
            type="button"
            variant="quiet"
            className="mt-4"
            onClick={() => {
              save.reset();
              setEditing(true);
            }}
          >
            Edit details
          </Button>
        ) : null}
      </div>
    );
  }
  return (
    <form onSubmit={submit} className="space-y-3" aria-busy={save.isPending}>
      <Field label="Measurement kind">
        <Select value={form.kind} onChange={set("kind")}>
          {KIND_OPTIONS.map(([value, label]) => (
            <option key={value} value={value}>
              {label}
            </option>
          ))}
        </Select>
      </Field>
      <Field label="Sample">
        <TextInput value={form.sample} onChange={set("sample")} />
      </Field>
      <Field label="Instrument">
        <TextInput value={form.instrument} onChange={set("instrument")} />
      </Field>
      <Field label="Measured" hint="a date such as 2026-03-14 or 2026-03-14T10:30:00Z">
        <TextInput value={form.measuredAt} onChange={set("measuredAt")} />
      </Field>
      <Field label="Notes">
        <textarea
          value={form.notes}
          onChange={set("notes")}
          rows={4}
          className="w-full rounded-sm border border-rule bg-white px-2.5 py-1.5 text-sm focus:border-accent"
        />
      </Field>
      <Field label="Tags" hint="key=value, key=value" error={tagResult.error}>
        <TextInput value={form.tags} onChange={set("tags")} />
      </Field>
      {save.isError ? <Notice ok={false}>{save.error.message}</Notice> : null}
      <div className="flex gap-2">
        <Button type="submit" disabled={save.isPending || Boolean(tagResult.error)}>
          {save.isPending ? "Saving…" : "Save details"}
        </Button>
        <Button type="button" variant="quiet" onClick={() => setEditing(false)}>
          Cancel
        </Button>
      </div>
    </form>
  );
}
