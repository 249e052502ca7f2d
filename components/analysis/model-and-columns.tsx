"use client";
import { Field, Select } from "@/components/ui";
import { axisTitle } from "@/lib/data/format";
import type { ModelInfo } from "./api";
import { orderModels, type Column } from "./fit-options";

export const kindWords = (kind: string) => kind.replace(/_/g, " ");

/** The models as a select's options: those made for this measurement first, then the others. */
export function ModelOptions({ models, kind }: { models: readonly ModelInfo[]; kind: string }) {
  const { suggested, others } = orderModels(models, kind);
  return (
    <>
      {suggested.length ? (
        <optgroup label={`Suggested for ${kindWords(kind)}`}>
          {suggested.map((m) => (
            <option key={m.id} value={m.id}>
              {m.title} ({m.id})
            </option>
          ))}
        </optgroup>
      ) : null}
      <optgroup label={suggested.length ? "Other models" : "Models"}>
        {others.map((m) => (
          <option key={m.id} value={m.id}>
            {m.title} ({m.id})
          </option>
        ))}
      </optgroup>
    </>
  );
}

/** The model (those made for this measurement first) and its formula. */
export function ModelSelect({
  models,
  kind,
  value,
  onChange,
  label = "Model",
}: {
  models: readonly ModelInfo[];
  kind: string;
  value: string;
  onChange: (id: string) => void;
  label?: string;
}) {
  const model = models.find((m) => m.id === value);
  return (
    <div>
      <Field label={label}>
        <Select value={value} onChange={(e) => onChange(e.target.value)}>
          <ModelOptions models={models} kind={kind} />
        </Select>
      </Field>
      {model ? (
        <p className="mt-2 rounded-sm border border-rule bg-paper px-3 py-2 text-[15px]" data-testid="model-formula">
          {model.formula}
        </p>
      ) : null}
    </div>
  );
}

/** x, y and the optional σ column, from the numeric columns. */
export function ColumnSelects({
  columns,
  value,
  onChange,
}: {
  columns: readonly Column[];
  value: { x: string; y: string; sigma: string };
  onChange: (v: { x: string; y: string; sigma: string }) => void;
}) {
  const numeric = columns.filter((c) => c.type === "number");
  const options = numeric.map((c) => (
    <option key={c.name} value={c.name}>
      {axisTitle(c.name, c.unit)}
    </option>
  ));
  return (
    <div className="grid grid-cols-1 gap-3 min-[420px]:grid-cols-3">
      <Field label="x column">
        <Select value={value.x} onChange={(e) => onChange({ ...value, x: e.target.value })}>
          {options}
        </Select>
      </Field>
      <Field label="y column">
        <Select value={value.y} onChange={(e) => onChange({ ...value, y: e.target.value })}>
          {options}
        </Select>
      </Field>
      <Field label="σ column" hint="per-point standard deviation of y">
        <Select value={value.sigma} onChange={(e) => onChange({ ...value, sigma: e.target.value })}>
          <option value="">none (unweighted)</option>
          {options}
        </Select>
      </Field>
    </div>
  );
}
