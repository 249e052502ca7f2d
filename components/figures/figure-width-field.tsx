"use client";
import { Field, Select, TextInput } from "@/components/ui";

/** Journal column widths (Nature-style single, 1.5 and double column), mm. */
const WIDTH_PRESETS = [
  { id: "single", label: "Single column · 89 mm", mm: 89 },
  { id: "one-and-a-half", label: "1.5 column · 120 mm", mm: 120 },
  { id: "double", label: "Double column · 183 mm", mm: 183 },
] as const;

/** The preset a width is, or "custom". */
export function presetFor(mm: number): string {
  return WIDTH_PRESETS.find((p) => p.mm === mm)?.id ?? "custom";
}

/** The width, mm, a preset stands for; "custom" reads the millimetres typed. */
export function widthMmOf(preset: string, customMm: string): number {
  return preset === "custom" ? Number(customMm) : WIDTH_PRESETS.find((p) => p.id === preset)!.mm;
}

/** The figure-width picker: the column presets and "Custom…". */
export function WidthPresetField({ value, onChange }: { value: string; onChange: (preset: string) => void }) {
  return (
    <Field label="Width">
      <Select value={value} onChange={(e) => onChange(e.target.value)}>
        {WIDTH_PRESETS.map((p) => (
          <option key={p.id} value={p.id}>
            {p.label}
          </option>
        ))}
        <option value="custom">Custom…</option>
      </Select>
    </Field>
  );
}

/** The millimetres of a custom width (30 to 300), shown while the picker says "Custom…". */
export function CustomWidthField({ value, onChange }: { value: string; onChange: (mm: string) => void }) {
  return (
    <Field label="Custom width (mm)">
      <TextInput type="number" min={30} max={300} step={1} value={value} onChange={(e) => onChange(e.target.value)} />
    </Field>
  );
}
