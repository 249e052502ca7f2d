"use client";
import { useState } from "react";

/** Copies a value (a hash, a command) and says so in words. */
export function CopyButton({ value, label }: { value: string; label: string }) {
  const [state, setState] = useState<"idle" | "copied" | "failed">("idle");
  const copy = async () => {
    try {
      await navigator.clipboard.writeText(value);
      setState("copied");
    } catch {
      setState("failed");
    }
    setTimeout(() => setState("idle"), 2000);
  };
  return (
    <button
      type="button"
      onClick={() => void copy()}
      aria-label={label}
      title={label}
      className="rounded-sm border border-rule bg-sheet px-1.5 py-0.5 text-xs text-muted hover:bg-paper hover:text-ink"
    >
      {state === "copied" ? "✓ copied" : state === "failed" ? "✕ select and copy" : "copy"}
    </button>
  );
}
