"use client";
import { Field, Select, TextInput } from "@/components/ui";
import { axisTitle } from "@/lib/data/format";
import type { Marker, TemplateOptionField } from "@/lib/figures/templates";

export interface ColumnInfo {
  name: string;
  unit: string | null;
  type: string;
}

/** One template option as a form control (data names are drawn by the sources block instead). */
export function OptionInput({
  field,
  value,
  onChange,
  columns,
}: {
  field: TemplateOptionField;
  value: unknown;
  onChange: (v: unknown) => void;
  columns?: ColumnInfo[];
}) {
  const label = field.kind === "number" ? axisTitle(field.label, field.unit) : field.label;
  switch (field.kind) {
    case "column": {
      const list = columns ?? [];
      const v = typeof value === "string" ? value : "";
      const known = list.some((c) => c.name === v);
      return (
        <Field label={label} hint={field.help}>
          <Select value={v} onChange={(e) => onChange(e.target.value)}>
            {!field.required ? <option value="">{field.key.startsWith("fit") ? "(as the data)" : "(none)"}</option> : null}
            {v && !known ? <option value={v}>{v} (not in the bound data)</option> : null}
            {list.map((c) => (
              <option key={c.name} value={c.name}>
                {axisTitle(c.name, c.unit)}
              </option>
            ))}
          </Select>
        </Field>
      );
    }
    case "number":
      return (
        <Field label={label} hint={field.help}>
          <TextInput
            type="number"
            step="any"
            min={field.min}
            max={field.max}
            value={typeof value === "number" || typeof value === "string" ? String(value) : ""}
            onChange={(e) => onChange(e.target.value === "" ? undefined : Number(e.target.value))}
          />
        </Field>
      );
    case "select":
      return (
        <Field label={label} hint={field.help}>
          <Select value={typeof value === "string" ? value : field.default} onChange={(e) => onChange(e.target.value)}>
            {field.choices.map((c) => (
              <option key={c.value} value={c.value}>
                {c.label}
              </option>
            ))}
          </Select>
        </Field>
      );
    case "boolean":
      return (
        <label className="flex items-center gap-2 pt-6 text-sm">
          <input type="checkbox" className="h-4 w-4 accent-accent" checked={Boolean(value ?? field.default)} onChange={(e) => onChange(e.target.checked)} />
          {field.label}
        </label>
      );
    case "markers":
      return <MarkersInput label={label} help={field.help} value={(value as Marker[] | undefined) ?? field.default} onChange={onChange} />;
    case "text":
      return (
        <Field label={label} hint={field.help}>
          <TextInput value={typeof value === "string" ? value : (field.default ?? "")} onChange={(e) => onChange(e.target.value)} />
        </Field>
      );
    default:
      return null;
  }
}

/** Marker lines as text, one per line: "637.4 NV⁻ ZPL". */
function MarkersInput({ label, help, value, onChange }: { label: string; help?: string; value: Marker[]; onChange: (v: unknown) => void }) {
  const text = value.map((m) => `${m.position} ${m.label}`).join("\n");
  return (
    <Field label={label} hint={help ? `${help} — one per line: position label` : "one per line: position label"}>
      <textarea
        className="w-full rounded-sm border border-rule bg-white px-2.5 py-1.5 font-mono text-xs"
        rows={3}
        defaultValue={text}
        onBlur={(e) =>
          onChange(
            e.target.value
              .split("\n")
              .map((l) => l.trim())
              .filter(Boolean)
              .map((l) => {
                const [pos, ...rest] = l.split(/\s+/);
                return { position: Number(pos), label: rest.join(" ") };
              })
              .filter((m) => Number.isFinite(m.position)),
          )
        }
      />
    </Field>
  );
}
