import { jsonPositions, spanFor } from "./json-positions";

interface SpecProblem {
  path: string;
  message: string;
  from: number;
  to: number;
}
export type SpecCheck = { ok: true; spec: Record<string, unknown>; dataNames: string[] } | { ok: false; syntax: boolean; problems: SpecProblem[] };

/** JSON syntax, then the same validation the server runs (loaded on first use: the Vega-Lite schema is large). */
export async function checkSpecText(text: string): Promise<SpecCheck> {
  let parsed: unknown;
  try {
    parsed = JSON.parse(text);
  } catch (e) {
    return { ok: false, syntax: true, problems: [{ path: "(JSON)", message: (e as Error).message, from: 0, to: 1 }] };
  }
  const { validateSpec } = await import("@/lib/figures/validate-spec");
  const r = validateSpec(parsed);
  if (r.ok) return { ok: true, spec: r.spec as unknown as Record<string, unknown>, dataNames: r.dataNames };
  const pos = jsonPositions(text);
  return {
    ok: false,
    syntax: false,
    problems: r.errors.map((e) => ({ path: e.path, message: e.message, ...(pos ? spanFor(pos, e.pointer) : { from: 0, to: 1 }) })),
  };
}
