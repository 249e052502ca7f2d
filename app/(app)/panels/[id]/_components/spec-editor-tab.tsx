"use client";
import { useMutation } from "@tanstack/react-query";
import { useCallback, useEffect, useState } from "react";
import { sendJson } from "@/components/api-client";
import type { RevisionView } from "@/components/figures/api";
import type { Diagnostic } from "@/components/figures/json-editor";
import { JsonEditorLazy } from "@/components/figures/json-editor-lazy";
import { PanelChartLazy } from "@/components/figures/panel-chart-lazy";
import { checkSpecText, type SpecCheck } from "@/components/figures/spec-check";
import { toBinding, usePreviewData, type BindingChoice } from "@/components/figures/use-preview-data";
import { SaveRevisionBar } from "./save-revision-bar";

interface SavedRevision {
  id: string;
  bindings: RevisionView["bindings"];
  number: number;
}

/** The spec as JSON with inline errors, a live preview with the chosen data, undo, and Save as a new revision. */
export function SpecEditorTab({
  panelId,
  text,
  onText,
  choices,
  revision,
  baseRevisionId,
  editable,
  widthMm,
  onSaved,
}: {
  panelId: string;
  text: string;
  onText: (t: string) => void;
  choices: Record<string, BindingChoice>;
  revision: SavedRevision | null;
  baseRevisionId: string | null;
  editable: boolean;
  widthMm: number;
  onSaved: (r: RevisionView) => void;
}) {
  const [check, setCheck] = useState<SpecCheck | null>(null);
  const [previewSpec, setPreviewSpec] = useState<unknown>(null);
  const [message, setMessage] = useState("");
  const preview = usePreviewData(choices, revision);

  useEffect(() => {
    let stale = false;
    const t = setTimeout(() => {
      void checkSpecText(text).then((c) => {
        if (stale) return;
        setCheck(c);
        try {
          setPreviewSpec(JSON.parse(text));
        } catch {
          /* keep the last good preview */
        }
      });
    }, 450);
    return () => {
      stale = true;
      clearTimeout(t);
    };
  }, [text]);

  const lint = useCallback(async (t: string): Promise<Diagnostic[]> => {
    const c = await checkSpecText(t);
    return c.ok || c.syntax
      ? []
      : c.problems.map((p) => ({ from: p.from, to: Math.max(p.to, p.from + 1), severity: "error", message: `${p.path}: ${p.message}` }));
  }, []);

  const used = check?.ok ? check.dataNames : [];
  const unbound = used.filter((n) => !choices[n]);
  const save = useMutation({
    mutationFn: () => {
      const bindings = Object.fromEntries(used.filter((n) => choices[n]).map((n) => [n, toBinding(choices[n])]));
      return sendJson<RevisionView>(`/api/panels/${panelId}/revisions`, "POST", { spec: JSON.parse(text) as unknown, bindings, baseRevisionId, message });
    },
    onSuccess: (r) => {
      setMessage("");
      onSaved(r);
    },
  });
  const blocked = !check?.ok
    ? "Fix the problems in the spec first."
    : unbound.length
      ? `Bind ${unbound.map((n) => `“${n}”`).join(", ")} first (builder).`
      : null;

  return (
    <div className="grid gap-4 2xl:grid-cols-2">
      <div className="min-w-0">
        <JsonEditorLazy value={text} onChange={onText} lint={lint} readOnly={!editable} label="Vega-Lite spec (JSON)" />
        <div aria-live="polite" className="mt-2 text-sm">
          {check === null ? (
            <span className="text-muted">checking…</span>
          ) : check.ok ? (
            <span className="text-good" data-testid="spec-status">
              <span aria-hidden>✓ </span>Valid Vega-Lite · data {used.length ? used.map((n) => `“${n}”`).join(", ") : "none"}
            </span>
          ) : (
            <div role="alert" className="text-bad" data-testid="spec-status">
              <p>
                <span aria-hidden>✕ </span>
                {check.syntax ? "Not valid JSON" : `${check.problems.length} problem${check.problems.length === 1 ? "" : "s"} in the spec`}
              </p>
              <ul className="mt-1 list-disc pl-5 text-xs">
                {check.problems.map((p, i) => (
                  <li key={i}>
                    <code>{p.path}</code>: {p.message}
                  </li>
                ))}
              </ul>
            </div>
          )}
        </div>
      </div>
      {editable ? (
        <div className="min-w-0">
          <h3 className="mb-1 text-sm font-semibold">
            Preview <span className="font-normal text-muted">{preview.saved ? "with the saved data" : "with the chosen data (first 10,000 rows)"}</span>
          </h3>
          <div className="overflow-x-auto rounded-sm border border-rule bg-white p-2" data-testid="preview">
            {previewSpec ? (
              <PanelChartLazy spec={previewSpec} data={preview.data} widthMm={widthMm} label="Preview of the edited spec" />
            ) : (
              <p className="text-sm text-muted">The preview appears when the spec is valid JSON.</p>
            )}
          </div>
          {preview.error ? (
            <p role="alert" className="mt-1 text-xs text-bad">
              ✕ {preview.error.message}
            </p>
          ) : null}
          <div className="mt-4">
            <SaveRevisionBar
              formLabel="Save revision"
              noteLabel="Revision note"
              noteHint="What changed and why, for your co-authors."
              placeholder="e.g. axis title with units"
              note={message}
              onNote={setMessage}
              revisionNumber={revision ? revision.number : null}
              blocked={blocked}
              pending={save.isPending}
              error={save.error}
              savedNumber={save.isSuccess ? save.data.number : null}
              onSave={() => save.mutate()}
            />
          </div>
        </div>
      ) : (
        <p className="text-sm text-muted">PI and authors edit specs; you can read the current one here (drawn above).</p>
      )}
    </div>
  );
}
