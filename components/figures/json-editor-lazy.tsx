"use client";
import dynamic from "next/dynamic";

/** CodeMirror loads in the browser only, when the editor is shown. */
export const JsonEditorLazy = dynamic(() => import("./json-editor").then((m) => m.JsonEditor), {
  ssr: false,
  loading: () => <div className="h-72 animate-pulse rounded-sm border border-rule bg-paper" aria-hidden />,
});
