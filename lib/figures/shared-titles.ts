/**
 * One y-axis title per row: when a figure shares y titles, a panel whose y axis reads the same as
 * the first panel of its row leaves its title out (the plots stay lined up; the figure reads as
 * one scale across the row). Pure: the stored revisions are not changed, only what is drawn.
 */
import { axisTitlesOf } from "./describe-chart";
import { gridPlacement } from "./grid-placement.mjs";

type Json = { [key: string]: unknown };
const isObject = (v: unknown): v is Json => !!v && typeof v === "object" && !Array.isArray(v);

/** The spec with every y encoding titled `title` (at any depth: layers, concats) left untitled. */
export function withoutYTitle<T>(spec: T, title: string): T {
  const walk = (node: unknown): unknown => {
    if (Array.isArray(node)) return node.map(walk);
    if (!isObject(node)) return node;
    const out: Json = {};
    for (const [k, v] of Object.entries(node)) {
      if (k === "data" || k === "datasets" || k === "usermeta" || k === "config") out[k] = v;
      else if (k === "encoding" && isObject(v) && isObject(v.y) && v.y.title === title) out[k] = { ...v, y: { ...v.y, title: null } };
      else out[k] = walk(v);
    }
    return out;
  };
  return walk(spec) as T;
}

/** Specs in figure order with `rows[i]` the grid row of panel i: repeated y titles after each row's first panel left out. */
export function shareYTitles<T>(specs: T[], rows: number[]): T[] {
  const firstTitle = new Map<number, string | null>();
  return specs.map((spec, i) => {
    const own = axisTitlesOf(spec).y;
    if (!firstTitle.has(rows[i])) {
      firstTitle.set(rows[i], own);
      return spec;
    }
    const shared = firstTitle.get(rows[i]);
    return own !== null && own === shared ? withoutYTitle(spec, own) : spec;
  });
}

/**
 * For the figure page's preview: per panel (in figure order, with its column span and its spec,
 * undefined while loading), the y title to leave out because it repeats the first panel of its
 * grid row; undefined where the panel keeps its title.
 */
export function yTitlesLeftOut(panels: Array<{ span: number; spec: unknown }>, columns: number): Array<string | undefined> {
  const rows = gridPlacement(panels, columns).map((c) => c.row);
  const rowTitle = new Map<number, string | null>();
  return panels.map((p, i) => {
    const own = p.spec === undefined ? null : axisTitlesOf(p.spec).y;
    if (!rowTitle.has(rows[i])) {
      rowTitle.set(rows[i], own);
      return undefined;
    }
    return own !== null && own === rowTitle.get(rows[i]) ? own : undefined;
  });
}
