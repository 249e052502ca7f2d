"use client";
import { Field, Select } from "@/components/ui";
import { FIGURE_TEMPLATES } from "@/lib/figures/templates";
import { KIND_WORDS, templateOf } from "./builder-model";

/** The template select with its description, and the suggestion of the template that suits the measured data. */
export function BuilderTemplateRow({
  templateId,
  onTemplate,
  measuredKind,
  suggested,
  onUseSuggested,
}: {
  templateId: string;
  onTemplate: (id: string) => void;
  measuredKind: string | null;
  /** The template suiting the measured data, when it is another one and nothing recorded the choice. */
  suggested: string | null;
  onUseSuggested: (id: string) => void;
}) {
  const template = templateOf(templateId);
  return (
    <>
      <div className="grid gap-3 sm:grid-cols-[21rem_minmax(0,1fr)] sm:items-end">
        <Field label="Template">
          <Select value={templateId} onChange={(e) => onTemplate(e.target.value)}>
            {FIGURE_TEMPLATES.map((t) => (
              <option key={t.id} value={t.id}>
                {t.title}
              </option>
            ))}
          </Select>
        </Field>
        <p className="pb-1.5 text-sm text-muted">{template.description}</p>
      </div>
      {measuredKind && suggested ? (
        <p className="text-sm" data-testid="template-suggestion">
          This is {KIND_WORDS[measuredKind] ?? "this kind of data"}: {templateOf(suggested).title.toLowerCase()} suits it.{" "}
          <button type="button" className="underline" onClick={() => onUseSuggested(suggested)}>
            Use it
          </button>
        </p>
      ) : null}
    </>
  );
}
