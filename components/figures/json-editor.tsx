"use client";
import { redo, undo } from "@codemirror/commands";
import { json, jsonParseLinter } from "@codemirror/lang-json";
import { linter, lintGutter, type Diagnostic } from "@codemirror/lint";
import { basicSetup, EditorView } from "codemirror";
import { useEffect, useRef } from "react";

export type { Diagnostic };

/**
 * CodeMirror 6 for JSON, used directly: the view is made once in an effect; `value` changes from
 * outside (the builder) are applied as an ordinary transaction, so undo takes them back too.
 */
export function JsonEditor({
  value,
  onChange,
  lint,
  readOnly = false,
  label,
  className = "",
}: {
  value: string;
  onChange: (text: string) => void;
  lint?: (text: string) => Promise<Diagnostic[]> | Diagnostic[];
  readOnly?: boolean;
  label: string;
  className?: string;
}) {
  const host = useRef<HTMLDivElement>(null);
  const view = useRef<EditorView | null>(null);
  const onChangeRef = useRef(onChange);
  const lintRef = useRef(lint);
  const valueRef = useRef(value);
  useEffect(() => {
    onChangeRef.current = onChange;
    lintRef.current = lint;
    valueRef.current = value;
  });

  useEffect(() => {
    const syntax = jsonParseLinter();
    const v = new EditorView({
      doc: valueRef.current,
      parent: host.current!,
      extensions: [
        basicSetup,
        json(),
        lintGutter(),
        linter(
          async (ev) => {
            const bad = syntax(ev);
            if (bad.length) return bad.map((d) => ({ ...d, message: `JSON: ${d.message}` }));
            return (await lintRef.current?.(ev.state.doc.toString())) ?? [];
          },
          { delay: 350 },
        ),
        EditorView.editable.of(!readOnly),
        EditorView.contentAttributes.of({ "aria-label": label }),
        EditorView.updateListener.of((u) => {
          if (u.docChanged) onChangeRef.current(u.state.doc.toString());
        }),
        EditorView.theme({
          "&": { fontSize: "12.5px", backgroundColor: "white", maxHeight: "34rem", minHeight: "12rem" },
          ".cm-scroller": { overflow: "auto", fontFamily: "ui-monospace, SFMono-Regular, Menlo, monospace", lineHeight: "1.5" },
          ".cm-gutters": { backgroundColor: "#f7f5f0", borderRight: "1px solid #ddd8cc" },
        }),
      ],
    });
    // The scroller must be reachable by keyboard even when the text is read-only (not focusable itself).
    v.scrollDOM.tabIndex = 0;
    v.scrollDOM.setAttribute("role", "region");
    v.scrollDOM.setAttribute("aria-label", `${label}, scrollable`);
    view.current = v;
    return () => {
      v.destroy();
      view.current = null;
    };
  }, [readOnly, label]); // made once (the text it starts from is read through a ref): later values arrive through the effect below

  useEffect(() => {
    const v = view.current;
    if (v && v.state.doc.toString() !== value) v.dispatch({ changes: { from: 0, to: v.state.doc.length, insert: value } });
  }, [value]);

  const run = (cmd: typeof undo) => {
    if (view.current) {
      cmd(view.current);
      view.current.focus();
    }
  };
  return (
    <div className={className}>
      {!readOnly ? (
        <div className="mb-1 flex gap-1 text-xs">
          <button type="button" className="rounded-sm border border-rule bg-sheet px-2 py-0.5 hover:bg-paper" onClick={() => run(undo)} title="Ctrl/⌘ + Z">
            Undo
          </button>
          <button
            type="button"
            className="rounded-sm border border-rule bg-sheet px-2 py-0.5 hover:bg-paper"
            onClick={() => run(redo)}
            title="Ctrl/⌘ + Shift + Z"
          >
            Redo
          </button>
        </div>
      ) : null}
      <div ref={host} className="h-full overflow-hidden rounded-sm border border-rule" data-testid="spec-editor" />
    </div>
  );
}
