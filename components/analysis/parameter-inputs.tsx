"use client";
import { formatNumber } from "@/lib/data/format";
import { EMPTY_DRAFT, type DefaultBounds, type ParamDraft } from "./fit-options";

export interface ParamRow {
  name: string;
  description: string;
  unit: string;
}

const cell = "px-2 py-1.5 align-middle";
const input = "w-full min-w-0 rounded-sm border border-rule bg-white px-2 py-1 text-sm tabular-nums focus:border-accent disabled:bg-paper disabled:text-muted";

function boundPlaceholder(defaults: DefaultBounds | undefined, name: string, side: 0 | 1): string {
  const b = defaults?.[name];
  if (!b) return "default";
  const v = b[side];
  return v === null || v === undefined ? (side ? "∞" : "−∞") : formatNumber(v, 3);
}

const lastText = (v: number | null | undefined) => (v === null || v === undefined || !Number.isFinite(v) ? "" : String(Number(v.toPrecision(4))));

/** Start values, fixed parameters and bounds; every blank means "let the model decide". */
export function ParameterInputs({
  rows,
  drafts,
  defaults,
  lastValues,
  onChange,
  disabled,
}: {
  rows: ParamRow[];
  drafts: Record<string, ParamDraft>;
  defaults?: DefaultBounds;
  lastValues?: Record<string, number | null>;
  onChange: (name: string, draft: ParamDraft) => void;
  disabled?: boolean;
}) {
  return (
    <div className="overflow-x-auto">
      <table className="w-full min-w-[720px] text-sm">
        <caption className="sr-only">Fit parameters: start values, fixed parameters and bounds</caption>
        <thead className="text-left text-xs uppercase tracking-wide text-muted">
          <tr className="border-b border-rule">
            <th className={cell}>Parameter</th>
            <th className={cell}>Meaning</th>
            <th className={cell}>Unit</th>
            <th className={`${cell} w-28`}>Start</th>
            <th className={`${cell} w-40`}>Hold fixed at</th>
            <th className={`${cell} w-28`}>Lower bound</th>
            <th className={`${cell} w-28`}>Upper bound</th>
          </tr>
        </thead>
        <tbody className="divide-y divide-rule/70">
          {rows.map((p) => {
            const d = drafts[p.name] ?? EMPTY_DRAFT;
            const set = (patch: Partial<ParamDraft>) => onChange(p.name, { ...d, ...patch });
            return (
              <tr key={p.name}>
                <th scope="row" className={`${cell} text-left font-mono font-medium`}>
                  {p.name}
                </th>
                <td className={`${cell} text-muted`}>{p.description}</td>
                <td className={cell}>{p.unit || <span className="text-muted">1</span>}</td>
                <td className={cell}>
                  <input
                    className={input}
                    inputMode="decimal"
                    placeholder="auto"
                    aria-label={`${p.name} start value`}
                    value={d.start}
                    disabled={disabled || d.fixed}
                    onChange={(e) => set({ start: e.target.value })}
                  />
                </td>
                <td className={cell}>
                  <span className="flex items-center gap-2">
                    <input
                      type="checkbox"
                      aria-label={`Hold ${p.name} fixed`}
                      checked={d.fixed}
                      disabled={disabled}
                      onChange={(e) => set({ fixed: e.target.checked, fixedValue: d.fixedValue || d.start || lastText(lastValues?.[p.name]) })}
                    />
                    <input
                      className={input}
                      inputMode="decimal"
                      placeholder={d.fixed ? "value" : "free"}
                      aria-label={`${p.name} fixed value`}
                      value={d.fixedValue}
                      disabled={disabled || !d.fixed}
                      onChange={(e) => set({ fixedValue: e.target.value })}
                    />
                  </span>
                </td>
                <td className={cell}>
                  <input
                    className={input}
                    inputMode="decimal"
                    placeholder={boundPlaceholder(defaults, p.name, 0)}
                    aria-label={`${p.name} lower bound`}
                    value={d.lower}
                    disabled={disabled || d.fixed}
                    onChange={(e) => set({ lower: e.target.value })}
                  />
                </td>
                <td className={cell}>
                  <input
                    className={input}
                    inputMode="decimal"
                    placeholder={boundPlaceholder(defaults, p.name, 1)}
                    aria-label={`${p.name} upper bound`}
                    value={d.upper}
                    disabled={disabled || d.fixed}
                    onChange={(e) => set({ upper: e.target.value })}
                  />
                </td>
              </tr>
            );
          })}
        </tbody>
      </table>
    </div>
  );
}
