"use client";
import { useId, useState, type KeyboardEvent } from "react";
import { matchesQuery } from "@/lib/data/search-match";

interface PickerOption {
  value: string;
  label: string;
  /** A second line: kind, sample, tags, version, date. */
  detail: string;
  /** Extra words typed searches find it by (name, sample, tags, kind). */
  search: string[];
}
export interface PickerGroup {
  key: string;
  label: string;
  options: PickerOption[];
}

/**
 * A text box that filters grouped options as one types (WAI-ARIA combobox with a listbox): arrows move
 * through the options, Enter chooses, Escape closes; the chosen option's name shows when not searching.
 */
export function SearchablePicker({
  label,
  hint,
  value,
  groups,
  noneLabel,
  empty,
  onChange,
  onQuery,
}: {
  label: string;
  hint?: string;
  value: string | null;
  groups: PickerGroup[];
  /** Offered first when the choice is optional. */
  noneLabel?: string;
  /** What the list says when nothing is there to choose. */
  empty: string;
  onChange: (value: string | null) => void;
  onQuery?: (query: string) => void;
}) {
  const id = useId();
  const [query, setQuery] = useState<string | null>(null);
  const [open, setOpen] = useState(false);
  const [active, setActive] = useState(0);
  const chosen = groups.flatMap((g) => g.options).find((o) => o.value === value);
  const shown = groups
    .map((g) => ({ ...g, options: g.options.filter((o) => matchesQuery(query ?? "", [g.label, o.label, o.detail, ...o.search])) }))
    .filter((g) => g.options.length);
  const flat: Array<{ value: string | null; optionId: string }> = [
    ...(noneLabel ? [{ value: null, optionId: `${id}-none` }] : []),
    ...shown.flatMap((g, gi) => g.options.map((o, oi) => ({ value: o.value, optionId: `${id}-${gi}-${oi}` }))),
  ];
  const at = Math.min(active, flat.length - 1);

  const typed = (q: string | null) => {
    setQuery(q);
    setActive(0);
    onQuery?.(q ?? "");
  };
  const choose = (v: string | null) => {
    onChange(v);
    typed(null);
    setOpen(false);
  };
  function onKey(e: KeyboardEvent<HTMLInputElement>) {
    if (e.key === "ArrowDown" || e.key === "ArrowUp") {
      e.preventDefault();
      if (!open) setOpen(true);
      else if (flat.length) setActive((a) => (Math.min(a, flat.length - 1) + (e.key === "ArrowDown" ? 1 : flat.length - 1)) % flat.length);
    } else if (e.key === "Enter" && open) {
      e.preventDefault();
      if (flat[at]) choose(flat[at].value);
    } else if (e.key === "Escape" && open) {
      e.preventDefault();
      setOpen(false);
      typed(null);
    }
  }

  const optionClass = (on: boolean) => `cursor-pointer rounded-sm px-2 py-1 ${on ? "bg-paper outline outline-1 outline-ink" : ""}`;
  return (
    <div className="relative text-sm">
      <label htmlFor={`${id}-input`} className="mb-1 block font-medium">
        {label}
      </label>
      <input
        id={`${id}-input`}
        role="combobox"
        aria-expanded={open && flat.length > 0}
        aria-controls={`${id}-list`}
        aria-autocomplete="list"
        aria-activedescendant={open && flat[at] ? flat[at].optionId : undefined}
        aria-describedby={hint ? `${id}-hint` : undefined}
        autoComplete="off"
        placeholder="type a name, sample, tag or kind"
        className="w-full rounded-sm border border-rule bg-white px-2 py-1.5"
        value={query ?? chosen?.label ?? ""}
        onChange={(e) => {
          typed(e.target.value);
          setOpen(true);
        }}
        onFocus={() => setOpen(true)}
        onClick={() => setOpen(true)}
        onBlur={() => {
          setOpen(false);
          typed(null);
        }}
        onKeyDown={onKey}
      />
      {hint ? (
        <span id={`${id}-hint`} className="mt-1 block text-xs text-muted">
          {hint}
        </span>
      ) : null}
      {chosen && !open ? <span className="mt-0.5 block text-xs text-muted">{chosen.detail}</span> : null}
      <div
        hidden={!open}
        className="absolute z-20 mt-1 max-h-80 w-full overflow-y-auto rounded-sm border border-rule bg-sheet p-1 shadow-md"
        onMouseDown={(e) => e.preventDefault()}
      >
        <ul id={`${id}-list`} role="listbox" aria-label={`${label}: choices`} hidden={flat.length === 0}>
          {noneLabel ? (
            <li id={`${id}-none`} role="option" aria-selected={value === null} className={optionClass(at === 0)} onClick={() => choose(null)}>
              {noneLabel}
            </li>
          ) : null}
          {shown.map((g, gi) => (
            <li key={g.key} role="presentation">
              <ul role="group" aria-labelledby={`${id}-g${gi}`}>
                <li role="presentation" id={`${id}-g${gi}`} className="px-2 pt-1.5 text-xs font-semibold text-muted">
                  {g.label}
                </li>
                {g.options.map((o, oi) => {
                  const optionId = `${id}-${gi}-${oi}`;
                  return (
                    <li
                      key={o.value}
                      id={optionId}
                      role="option"
                      aria-selected={o.value === value}
                      aria-labelledby={`${optionId}-name`}
                      aria-describedby={`${optionId}-detail`}
                      className={optionClass(flat[at]?.optionId === optionId)}
                      onClick={() => choose(o.value)}
                    >
                      <span className="block">
                        {o.value === value ? <span aria-hidden>✓ </span> : null}
                        <span id={`${optionId}-name`}>{o.label}</span>
                      </span>
                      <span id={`${optionId}-detail`} className="block text-xs text-muted">
                        {o.detail}
                      </span>
                    </li>
                  );
                })}
              </ul>
            </li>
          ))}
        </ul>
        {flat.length === (noneLabel ? 1 : 0) ? (
          <p role="status" className="px-2 py-1 text-xs text-muted">
            {query ? `Nothing matches “${query}”.` : empty}
          </p>
        ) : null}
      </div>
    </div>
  );
}
