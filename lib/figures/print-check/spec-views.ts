/** Walking a Vega-Lite spec: its drawn views and their units. */

export type Obj = Record<string, unknown>;
export const isObj = (v: unknown): v is Obj => typeof v === "object" && v !== null && !Array.isArray(v);
export const markType = (mark: unknown): string | null => (typeof mark === "string" ? mark : isObj(mark) && typeof mark.type === "string" ? mark.type : null);

/** One drawn view: a unit spec, or a layer with its units (encodings inherited as Vega-Lite does). */
export interface View {
  units: Array<{ mark: unknown; encoding: Obj; transform: unknown[] }>;
}

export function collectViews(spec: unknown): View[] {
  const views: View[] = [];
  const unitsOf = (node: Obj, encoding: Obj, transform: unknown[]): View["units"] => {
    const enc = { ...encoding, ...(isObj(node.encoding) ? node.encoding : {}) };
    const tr: unknown[] = [...transform, ...(Array.isArray(node.transform) ? (node.transform as unknown[]) : [])];
    if (Array.isArray(node.layer)) return node.layer.filter(isObj).flatMap((l) => unitsOf(l, enc, tr));
    return "mark" in node ? [{ mark: node.mark, encoding: enc, transform: tr }] : [];
  };
  const walk = (node: unknown) => {
    if (!isObj(node)) return;
    for (const key of ["vconcat", "hconcat", "concat"]) if (Array.isArray(node[key])) (node[key] as unknown[]).forEach(walk);
    if (isObj(node.spec)) walk(node.spec);
    if (Array.isArray(node.layer) || "mark" in node) views.push({ units: unitsOf(node, {}, []) });
  };
  walk(spec);
  return views;
}
