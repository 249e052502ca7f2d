import { blanksPlot, checkSpecFields, specFieldUses, type ColumnInfo } from "@/lib/figures/spec-fields";
import type { BoundRows, DataWarningView } from "./api";

/** "Nothing was drawn" from the browser: Vega's scenegraph has data marks but none holds an item. */
export const NOTHING_DRAWN: DataWarningView = {
  kind: "no_rows",
  dataName: "",
  message: "Nothing was drawn: after rendering, every data mark of this plot is empty (no row reached it — check the fields, filters and bound data).",
};

/**
 * A panel's data warnings as text with a shape (△), never colour alone: fields the bound data
 * lacks, data with no rows, rows left out. Shown above the chart and beside the approve button.
 */
export function DataWarningList({ warnings, className = "" }: { warnings: DataWarningView[]; className?: string }) {
  if (!warnings.length) return null;
  return (
    <ul
      aria-label="Data warnings"
      data-testid="data-warnings"
      className={`space-y-1 rounded-sm border border-warn/60 bg-white px-2.5 py-1.5 text-xs text-warn ${className}`}
    >
      {warnings.map((w, i) => (
        <li key={`${w.kind}-${w.dataName}-${w.field ?? ""}-${i}`} data-kind={w.kind}>
          <span aria-hidden>△ </span>
          <CodeText text={w.message} />
        </li>
      ))}
    </ul>
  );
}

/** Backticked names in a message as code. */
function CodeText({ text }: { text: string }) {
  const parts = text.split(/(`[^`]*`)/);
  return (
    <>
      {parts.map((p, i) =>
        p.length > 1 && p.startsWith("`") && p.endsWith("`") ? (
          <code key={i} className="rounded-sm bg-paper px-0.5 text-ink">
            {p.slice(1, -1)}
          </code>
        ) : (
          p
        ),
      )}
    </>
  );
}

/**
 * The same checks on rows already in the browser (the editor's preview, before saving): fields the
 * rows lack (columns = the first row's keys), and bound data with no rows.
 */
export function previewWarnings(spec: unknown, data: Record<string, BoundRows>): DataWarningView[] {
  const used = new Set(specFieldUses(spec).map((u) => u.dataName));
  const out: DataWarningView[] = [];
  const columns: Record<string, ColumnInfo[]> = {};
  for (const name of used) {
    const rows = data[name]?.rows;
    if (!rows) continue;
    if (!rows.length) out.push({ kind: "no_rows", dataName: name, message: `Nothing to draw: \`${name}\` has no rows.` });
    else columns[name] = Object.keys(rows[0]).map((c) => ({ name: c }));
  }
  const missing = checkSpecFields(spec, columns).map((p): DataWarningView => ({
    kind: "missing_field",
    dataName: p.dataName,
    field: p.field,
    columns: p.columns,
    suggestion: p.suggestion?.column ?? null,
    message: blanksPlot(p.channel) ? `Nothing to draw: ${p.message}` : p.message.charAt(0).toUpperCase() + p.message.slice(1),
  }));
  return [...missing, ...out];
}
