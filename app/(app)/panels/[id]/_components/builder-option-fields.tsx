"use client";
import { PRINT_OPTION_FIELDS, type FigureTemplate, type TemplateOptionField } from "@/lib/figures/templates";
import { OptionInput, type ColumnInfo } from "./option-input";

/** The template's column, axis-and-mark and print-size fields. */
export function BuilderOptionFields({
  template,
  withHint,
  columnValue,
  columnsFor,
  valueOf,
  printValue,
  onChange,
}: {
  template: FigureTemplate<any>;
  withHint: (f: TemplateOptionField) => TemplateOptionField;
  columnValue: (f: Extract<TemplateOptionField, { kind: "column" }>) => string;
  columnsFor: (f: TemplateOptionField) => ColumnInfo[];
  valueOf: (f: TemplateOptionField) => unknown;
  printValue: (f: TemplateOptionField) => unknown;
  onChange: (key: string, v: unknown) => void;
}) {
  const columnFields = template.options.filter((f): f is Extract<TemplateOptionField, { kind: "column" }> => f.kind === "column");
  const otherFields = template.options.filter((f) => f.kind !== "column" && f.kind !== "data-name");
  return (
    <>
      {columnFields.length ? (
        <fieldset>
          <legend className="mb-2 text-sm font-semibold">Columns</legend>
          <div className="grid gap-3 sm:grid-cols-2">
            {columnFields.map((f) => (
              <OptionInput key={f.key} field={withHint(f)} value={columnValue(f)} onChange={(v) => onChange(f.key, v)} columns={columnsFor(f)} />
            ))}
          </div>
        </fieldset>
      ) : null}

      <fieldset>
        <legend className="mb-2 text-sm font-semibold">Axes and marks</legend>
        <div className="grid gap-3 sm:grid-cols-2 lg:grid-cols-3">
          {otherFields.map((f) => (
            <OptionInput
              key={`${template.id}-${f.key}-${JSON.stringify(f.kind === "markers" ? valueOf(f) : "")}`}
              field={withHint(f)}
              value={valueOf(f)}
              onChange={(v) => onChange(f.key, v)}
            />
          ))}
        </div>
      </fieldset>

      <fieldset>
        <legend className="mb-2 text-sm font-semibold">Print size</legend>
        <div className="grid grid-cols-2 gap-3 lg:grid-cols-4">
          {PRINT_OPTION_FIELDS.map((f) => (
            <OptionInput key={f.key} field={withHint(f)} value={printValue(f)} onChange={(v) => onChange(f.key, v)} />
          ))}
        </div>
      </fieldset>
    </>
  );
}
