"use client";
import { formatNumber } from "@/lib/data/format";
import { EMPTY_DRAFT, type DefaultBounds, type ParamDraft } from "./fit-options";

export interface ParamRow {
  name: string;
  description: string;
  unit: string;
}

const numberInput =
  "min-w-0 rounded-sm border border-rule bg-white px-2 py-1 text-sm tabular-nums focus:border-accent disabled:border-dashed disabled:bg-paper disabled:text-muted";

function rangePlaceholder(defaults: DefaultBounds | undefined, name: string, end: 0 | 1): string {
  const b = defaults?.[name];
  if (!b) return "default";
  const v = b[end];
  return v === null || v === undefined ? (end ? "∞" : "−∞") : formatNumber(v, 3);
}

const lastText = (v: number | null | undefined) => (v === null || v === undefined || !Number.isFinite(v) ? "" : String(Number(v.toPrecision(4))));

/** The "fixed" switch: a real checkbox (Space toggles it) drawn as a sliding knob, with its word beside it. */
function FixedSwitch({ name, on, disabled, onToggle }: { name: string; on: boolean; disabled?: boolean; onToggle: (on: boolean) => void }) {
  return (
    <label className={`inline-flex shrink-0 items-center gap-1.5 text-xs ${disabled ? "text-muted" : "cursor-pointer"}`}>
      <input
        type="checkbox"
        role="switch"
        className="peer sr-only"
        aria-label={`Hold ${name} fixed`}
        checked={on}
        disabled={disabled}
        onChange={(e) => onToggle(e.target.checked)}
      />
      <span
        aria-hidden
        className="relative inline-block h-4 w-7 rounded-full border border-rule bg-paper transition-colors peer-disabled:opacity-50 peer-checked:border-accent peer-checked:bg-accent-soft peer-focus-visible:outline-2 peer-focus-visible:outline-offset-2 peer-focus-visible:outline-accent peer-checked:[&>span]:translate-x-3 peer-checked:[&>span]:bg-accent"
      >
        <span className="absolute top-0.5 left-0.5 h-2.5 w-2.5 rounded-full bg-muted transition-transform" />
      </span>
      <span className={on ? "font-medium text-ink" : "text-muted"}>fixed</span>
    </label>
  );
}

/**
 * One entry per parameter: its symbol and unit with what it means, the value the fit starts from (or,
 * switched to fixed, holds it at) and the range it may move in. Every blank means "let the model decide".
 */
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
    <ul aria-label="Fit parameters" className="divide-y divide-rule/70 rounded-sm border border-rule bg-sheet">
      {rows.map((p) => {
        const d = drafts[p.name] ?? EMPTY_DRAFT;
        const set = (patch: Partial<ParamDraft>) => onChange(p.name, { ...d, ...patch });
        const id = `fit-param-${p.name.replace(/[^\w-]/g, "_")}`;
        return (
          <li key={p.name} className="grid gap-x-6 gap-y-2 px-3 py-2.5 sm:grid-cols-[minmax(9rem,1fr)_auto_auto] sm:items-center">
            <div className="min-w-0">
              <p id={`${id}-name`} className="text-sm">
                <span className="font-mono font-semibold">{p.name}</span>
                <span className="ml-1.5 text-muted">{p.unit ? `in ${p.unit}` : "no unit"}</span>
              </p>
              <p id={`${id}-meaning`} className="text-xs text-muted">
                {p.description}
              </p>
            </div>

            <div className="min-w-0">
              <label htmlFor={`${id}-value`} className="mb-0.5 block text-xs text-muted">
                {d.fixed ? "Held value" : "Start value"}
              </label>
              <span className="flex items-center gap-2">
                <input
                  id={`${id}-value`}
                  className={`${numberInput} w-28 ${d.fixed ? "border-accent font-medium" : ""}`}
                  inputMode="decimal"
                  placeholder={d.fixed ? "value" : "auto"}
                  aria-label={d.fixed ? `${p.name} held value` : `${p.name} start value`}
                  aria-describedby={`${id}-meaning`}
                  value={d.value}
                  disabled={disabled}
                  onChange={(e) => set({ value: e.target.value })}
                />
                <FixedSwitch
                  name={p.name}
                  on={d.fixed}
                  disabled={disabled}
                  onToggle={(on) => set({ fixed: on, value: on && !d.value.trim() ? lastText(lastValues?.[p.name]) : d.value })}
                />
              </span>
            </div>

            <div role="group" aria-labelledby={`${id}-range ${id}-name`} className="min-w-0">
              <span id={`${id}-range`} className="mb-0.5 block text-xs text-muted">
                Allowed range{d.fixed ? " (not used while fixed)" : ""}
              </span>
              <span className="flex items-center gap-1.5 text-xs text-muted">
                <span aria-hidden>from</span>
                <input
                  className={`${numberInput} w-24`}
                  inputMode="decimal"
                  placeholder={rangePlaceholder(defaults, p.name, 0)}
                  aria-label={`${p.name} range from`}
                  value={d.lower}
                  disabled={disabled || d.fixed}
                  onChange={(e) => set({ lower: e.target.value })}
                />
                <span aria-hidden>to</span>
                <input
                  className={`${numberInput} w-24`}
                  inputMode="decimal"
                  placeholder={rangePlaceholder(defaults, p.name, 1)}
                  aria-label={`${p.name} range to`}
                  value={d.upper}
                  disabled={disabled || d.fixed}
                  onChange={(e) => set({ upper: e.target.value })}
                />
              </span>
            </div>
          </li>
        );
      })}
    </ul>
  );
}
