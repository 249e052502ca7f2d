"use client";
import { useSyncExternalStore } from "react";
import { flushSync } from "react-dom";

/** When the page went into print layout (ms since the epoch), or null on screen. */
let printedAt: number | null = null;
const listeners = new Set<() => void>();
let media: MediaQueryList | null = null;

function set(printing: boolean) {
  if (printing === (printedAt !== null)) return;
  printedAt = printing ? Date.now() : null;
  // The browser lays the page out for print right after `beforeprint`: render (and run effects) now.
  flushSync(() => listeners.forEach((l) => l()));
}
const onMedia = () => set(media!.matches);
const onBefore = () => set(true);
const onAfter = () => set(media!.matches);

function subscribe(onChange: () => void) {
  if (listeners.size === 0) {
    media = window.matchMedia("print");
    printedAt = media.matches ? Date.now() : null;
    media.addEventListener("change", onMedia);
    window.addEventListener("beforeprint", onBefore);
    window.addEventListener("afterprint", onAfter);
  }
  listeners.add(onChange);
  return () => {
    listeners.delete(onChange);
    if (listeners.size > 0 || !media) return;
    media.removeEventListener("change", onMedia);
    window.removeEventListener("beforeprint", onBefore);
    window.removeEventListener("afterprint", onAfter);
  };
}

/**
 * The moment printing began (the print dialog, `window.print()`, or print media emulated), null
 * on screen: the figure page draws at 100 % and stamps the date while it is set.
 */
export function usePrintedAt(): number | null {
  return useSyncExternalStore(
    subscribe,
    () => printedAt,
    () => null,
  );
}
