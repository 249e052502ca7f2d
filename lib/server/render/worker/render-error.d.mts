/** Types of render-error.mjs. */

export declare const PT_PER_MM: number;

export type RenderErrorCode =
  "invalid-spec" | "missing-data" | "load-refused" | "render-failed" | "bad-size" | "unsafe-svg" | "timeout" | "out-of-memory" | "worker-failed";

export declare class RenderError extends Error {
  constructor(code: RenderErrorCode, message: string);
  readonly code: RenderErrorCode;
}

export declare function rootSize(svg: string): { width: number; height: number };
