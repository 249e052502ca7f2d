"use client";
import { forwardRef, useEffect, useImperativeHandle, useState } from "react";
import type { SuggestionKeyDownProps, SuggestionProps } from "@tiptap/suggestion";

export interface MentionItem {
  id: string;
  label: string;
  role: string;
}
export interface MentionListHandle {
  onKeyDown: (p: SuggestionKeyDownProps) => boolean;
}

/** The @mention suggestion list: arrow keys move, Enter or Tab picks, Escape closes (handled by the caller). */
export const MentionList = forwardRef<MentionListHandle, SuggestionProps<MentionItem, { id: string; label: string }>>(function MentionList(
  { items, command },
  ref,
) {
  const [active, setActive] = useState(0);
  useEffect(() => setActive(0), [items]);
  const pick = (i: number) => {
    const it = items[i];
    if (it) command({ id: it.id, label: it.label });
  };
  useImperativeHandle(ref, () => ({
    onKeyDown: ({ event }) => {
      if (event.key === "ArrowDown") {
        setActive((a) => (a + 1) % Math.max(1, items.length));
        return true;
      }
      if (event.key === "ArrowUp") {
        setActive((a) => (a - 1 + items.length) % Math.max(1, items.length));
        return true;
      }
      if (event.key === "Enter" || event.key === "Tab") {
        pick(active);
        return true;
      }
      return false;
    },
  }));
  return (
    <ul role="listbox" aria-label="Mention a member" className="z-50 min-w-48 rounded-sm border border-rule bg-sheet py-1 text-sm shadow-md">
      {items.length === 0 ? (
        <li className="px-3 py-1 text-muted">no member matches</li>
      ) : (
        items.map((it, i) => (
          <li key={it.id} role="option" aria-selected={i === active}>
            <button
              type="button"
              className={`flex w-full justify-between gap-3 px-3 py-1 text-left ${i === active ? "bg-accent-soft" : ""}`}
              onMouseDown={(e) => {
                e.preventDefault();
                pick(i);
              }}
            >
              <span>{it.label}</span>
              <span className="text-xs text-muted">{it.role}</span>
            </button>
          </li>
        ))
      )}
    </ul>
  );
});
