/**
 * A chart in words, for its text alternative: an accessible name and a longer description made from
 * the Vega-Lite spec and the rows bound to it. Read by screen readers in place of the drawing.
 *
 * - the kind of plot from the mark types ("scatter plot", "line chart", "bar chart", …); a layered
 *   view lists every kind, data marks first, decoration (error bars, rules, labels) after;
 * - the axis titles as the spec writes them (units included, e.g. "τ (µs)"), falling back to the
 *   field name (`mean of T2` for an aggregate) when a channel has no title; a log scale is said;
 *   a colour channel is "coloured by …" (`rect` with a colour is a heatmap);
 * - composites: `vconcat` / `hconcat` / `concat` are "plots" described one by one, `facet` and the
 *   `row` / `column` / `facet` channels are "small multiples by …", `repeat` names the repeated fields;
 * - the number of rows per data name (the caller's counts; inline `values` counted from the spec);
 * - fitted values when the caller shows them, as given ("T2 = 12.3 ± 0.4 µs").
 *
 * `title` may be a string, an array of lines or an object with `text`; it becomes the name. Pure.
 */
import { formatCount } from "@/lib/data/format";

export interface ChartText {
  /** Short: the chart's title, or what it plots ("Scatter plot of signal against τ (µs)"). */
  name: string;
  /** Sentences: the plots, their axes, the rows per data name and the fitted values. */
  description: string;
}

type Obj = Record<string, unknown>;
const isObj = (v: unknown): v is Obj => typeof v === "object" && v !== null && !Array.isArray(v);

/** Mark type → the words for it, in the order they are listed (data marks before decoration). */
const KINDS: Array<[marks: string[], words: string]> = [
  [["point", "circle", "square"], "scatter plot"],
  [["line", "trail"], "line chart"],
  [["bar"], "bar chart"],
  [["area"], "area chart"],
  [["heatmap"], "heatmap"],
  [["boxplot"], "box plot"],
  [["arc"], "pie chart"],
  [["geoshape"], "map"],
  [["rect"], "rectangles"],
  [["tick"], "tick marks"],
  [["errorbar"], "error bars"],
  [["errorband"], "error band"],
  [["rule"], "rule lines"],
  [["text"], "text labels"],
  [["image"], "images"],
];

const ARRANGEMENT: Record<string, string> = { vconcat: "stacked vertically", hconcat: "side by side", concat: "in a grid" };
const NUMBER_WORDS = ["no", "one", "two", "three", "four", "five", "six", "seven", "eight", "nine", "ten"];

interface Plot {
  title: string | null;
  marks: string[];
  x: string[];
  y: string[];
  colour: string[];
  facets: string[];
  repeated: string[];
}

interface Context {
  encoding: Obj;
  repeat: Record<string, string[]>;
  /** Titles as written, without "on a log scale". */
  plain?: boolean;
}

/** A title as text: a string, lines joined, or the `text` of a title object; null when empty or absent. */
function textOf(v: unknown): string | null {
  if (typeof v === "string") return v.trim() || null;
  if (Array.isArray(v)) {
    const lines = v.filter((l): l is string => typeof l === "string" && l.trim() !== "").map((l) => l.trim());
    return lines.length ? lines.join(" ") : null;
  }
  if (isObj(v)) return textOf(v.text);
  return null;
}

const push = (list: string[], v: string | null) => {
  if (v && !list.includes(v)) list.push(v);
};

/** "a", "a and b", "a, b and c". */
function joinList(items: string[]): string {
  if (items.length <= 1) return items[0] ?? "";
  return `${items.slice(0, -1).join(", ")} and ${items[items.length - 1]}`;
}

const capitalize = (s: string) => (s ? s[0].toUpperCase() + s.slice(1) : s);
const sentence = (s: string) => {
  const t = s.trim();
  return /[.!?]$/.test(t) ? t : `${t}.`;
};

/** The field a channel reads, as a reader would name it: escapes removed, repeat references resolved, aggregates said. */
function fieldName(def: Obj, ctx: Context): string | null {
  let field: string | null = null;
  if (typeof def.field === "string") field = def.field.replace(/\\(.)/g, "$1");
  else if (isObj(def.field) && typeof def.field.repeat === "string") field = ctx.repeat[def.field.repeat]?.join(" / ") ?? "the repeated field";
  const aggregate = typeof def.aggregate === "string" ? def.aggregate : null;
  if (aggregate === "count" && !field) return "count";
  if (!field) return null;
  return aggregate ? `${aggregate} of ${field}` : field;
}

/** A channel's title: its own, its axis' or legend's or header's, else the field; null for a constant (`datum`, `value`). */
function channelTitle(def: unknown, ctx: Context): string | null {
  if (!isObj(def)) return null;
  const field = fieldName(def, ctx);
  if (!field) return null;
  const guide = [def.axis, def.legend, def.header].find((g) => isObj(g) && textOf(g.title)) as Obj | undefined;
  const title = textOf(def.title) ?? (guide ? textOf(guide.title) : null) ?? field;
  const scale = isObj(def.scale) && typeof def.scale.type === "string" ? def.scale.type : null;
  return !ctx.plain && (scale === "log" || scale === "symlog") ? `${title} on a ${scale === "log" ? "log" : "symmetric log"} scale` : title;
}

function markType(mark: unknown): string | null {
  if (typeof mark === "string") return mark;
  if (isObj(mark) && typeof mark.type === "string") return mark.type;
  return null;
}

function repeatMap(repeat: unknown): Record<string, string[]> {
  const names = (v: unknown) => (Array.isArray(v) ? v.filter((n): n is string => typeof n === "string") : []);
  if (Array.isArray(repeat)) return { repeat: names(repeat) };
  if (!isObj(repeat)) return {};
  return Object.fromEntries(Object.entries(repeat).map(([k, v]) => [k, names(v)]));
}

/** Adds one view (unit, layer, facet or repeat) and everything inside it to `plot`. */
function fill(node: unknown, ctx: Context, plot: Plot): void {
  if (!isObj(node)) return;
  if (isObj(node.spec) && (node.facet !== undefined || node.repeat !== undefined)) {
    if (isObj(node.facet)) {
      const defs = "field" in node.facet ? [node.facet] : [node.facet.row, node.facet.column];
      for (const d of defs) push(plot.facets, channelTitle(d, ctx));
    }
    const repeat = repeatMap(node.repeat);
    for (const names of Object.values(repeat)) for (const n of names) push(plot.repeated, n);
    return fill(node.spec, { ...ctx, repeat: { ...ctx.repeat, ...repeat } }, plot);
  }
  const encoding = { ...ctx.encoding, ...(isObj(node.encoding) ? node.encoding : {}) };
  const inner = { ...ctx, encoding };
  for (const key of ["layer", "vconcat", "hconcat", "concat"]) {
    const children = node[key];
    if (Array.isArray(children)) for (const child of children) fill(child, inner, plot);
  }
  const type = markType(node.mark);
  if (!type) return;
  const colourDef = isObj(encoding.color) ? encoding.color : encoding.fill;
  // A colour on the field an axis already shows repeats it: not said.
  const sameField = (c: string) => isObj(encoding[c]) && isObj(colourDef) && fieldName(encoding[c], inner) === fieldName(colourDef, inner);
  const colour = sameField("x") || sameField("y") ? null : channelTitle(colourDef, inner);
  push(plot.marks, type === "rect" && channelTitle(colourDef, inner) ? "heatmap" : type);
  push(plot.x, channelTitle(encoding.x, inner) ?? channelTitle(encoding.x2, inner));
  push(plot.y, channelTitle(encoding.y, inner) ?? channelTitle(encoding.y2, inner));
  for (const c of ["theta", "radius"]) push(plot.y, channelTitle(encoding[c], inner));
  push(plot.colour, colour);
  for (const c of ["facet", "row", "column"]) push(plot.facets, channelTitle(encoding[c], inner));
}

/** The plots a reader sees: one per member of a concatenation (nested ones flattened), else one. */
function plotsOf(node: unknown, ctx: Context): Plot[] {
  if (!isObj(node)) return [];
  const key = Object.keys(ARRANGEMENT).find((k) => Array.isArray(node[k]));
  if (key) return (node[key] as unknown[]).flatMap((child) => plotsOf(child, ctx));
  const plot: Plot = { title: textOf(node.title), marks: [], x: [], y: [], colour: [], facets: [], repeated: [] };
  fill(node, ctx, plot);
  return [plot];
}

function kindsOf(plot: Plot): string[] {
  const out: string[] = [];
  for (const [marks, words] of KINDS) if (plot.marks.some((m) => marks.includes(m))) out.push(words);
  for (const m of plot.marks) if (!KINDS.some(([marks]) => marks.includes(m))) out.push(`${m} marks`);
  return out;
}

/** "scatter plot and line chart of signal against τ (µs), coloured by sample". */
function plotPhrase(plot: Plot): string {
  const kinds = kindsOf(plot);
  let text = kinds.length ? joinList(kinds) : "empty plot";
  if (plot.y.length && plot.x.length) text += ` of ${joinList(plot.y)} against ${joinList(plot.x)}`;
  else if (plot.x.length) text += ` along ${joinList(plot.x)}`;
  else if (plot.y.length) text += ` of ${joinList(plot.y)}`;
  const colour = plot.colour.filter((c) => !plot.x.includes(c) && !plot.y.includes(c));
  if (colour.length) text += `, coloured by ${joinList(colour)}`;
  if (plot.facets.length) text += `, in small multiples by ${joinList(plot.facets)}`;
  if (plot.repeated.length) text += `, repeated for ${joinList(plot.repeated)}`;
  return text;
}

/** Data names in the order the spec reads them, and rows written inline in the spec. */
function dataSources(spec: unknown): { names: string[]; inline: number } {
  const names: string[] = [];
  let inline = 0;
  const walk = (node: unknown) => {
    if (Array.isArray(node)) return node.forEach(walk);
    if (!isObj(node)) return;
    for (const [k, v] of Object.entries(node)) {
      if (k === "usermeta" || k === "datasets") continue;
      if (k === "data" && isObj(v)) {
        if (Array.isArray(v.values)) inline += v.values.length;
        else if (typeof v.name === "string") push(names, v.name);
        continue;
      }
      walk(v);
    }
  };
  walk(spec);
  return { names, inline };
}

const rows = (n: number) => (n === 0 ? "no rows" : `${formatCount(n)} row${n === 1 ? "" : "s"}`);

function dataSentence(spec: Obj, rowCounts: Record<string, number>): string | null {
  const { names, inline } = dataSources(spec);
  const datasets = isObj(spec.datasets) ? spec.datasets : {};
  const parts = names.map((name) => {
    const count = rowCounts[name] ?? (Array.isArray(datasets[name]) ? datasets[name].length : undefined);
    return count === undefined ? `nothing bound to “${name}”` : `${rows(count)} of “${name}”`;
  });
  if (inline) parts.push(`${rows(inline)} written in the spec`);
  return parts.length ? `Data: ${parts.join(", ")}.` : null;
}

/**
 * The name and description of a chart. `rowCounts`: rows drawn per data name (bound data);
 * `fitLines`: fitted values already formatted ("T2 = 12.3 ± 0.4 µs"), said only when given.
 */
export function describeChart(spec: unknown, rowCounts: Record<string, number> = {}, fitLines: string[] = []): ChartText {
  if (!isObj(spec)) return { name: "Chart", description: "The chart's spec could not be read." };
  const plots = plotsOf(spec, { encoding: {}, repeat: {} });
  const arrangement = Object.keys(ARRANGEMENT).find((k) => Array.isArray(spec[k]));
  const composite = plots.length > 1 || Boolean(arrangement);
  const title = textOf(spec.title);
  const xs: string[] = [],
    ys: string[] = [];
  for (const p of plots) {
    p.x.forEach((x) => push(xs, x));
    p.y.forEach((y) => push(ys, y));
  }
  const count = NUMBER_WORDS[plots.length] ?? String(plots.length);
  const arranged = arrangement ? ARRANGEMENT[arrangement] : "";
  let generated: string;
  if (!composite) generated = capitalize(plotPhrase(plots[0]));
  else {
    generated = `${capitalize(count)} plots ${arranged}`.trim();
    if (ys.length && xs.length) generated += `: ${joinList(ys)} against ${joinList(xs)}`;
  }

  const sentences: string[] = [];
  const subtitle = isObj(spec.title) ? textOf(spec.title.subtitle) : null;
  if (subtitle) sentences.push(sentence(capitalize(subtitle)));
  const authored = typeof spec.description === "string" ? spec.description.trim() : "";
  if (authored && authored !== title) sentences.push(sentence(authored));
  if (!composite) sentences.push(sentence(capitalize(plotPhrase(plots[0]))));
  else {
    sentences.push(sentence(`${capitalize(count)} plots ${arranged}`.trim()));
    plots.forEach((p, i) => sentences.push(sentence(`Plot ${i + 1}${p.title ? ` (“${p.title}”)` : ""}: ${plotPhrase(p)}`)));
  }
  const data = dataSentence(spec, rowCounts);
  if (data) sentences.push(data);
  const fits = fitLines.map((l) => l.trim()).filter(Boolean);
  if (fits.length) sentences.push(`Fitted values: ${fits.join("; ")}.`);
  return { name: title ?? generated, description: sentences.join(" ") };
}

/**
 * The x and y titles of the first plot (the one review anchors are placed in), as written or the
 * field names; null for a channel it does not have.
 */
export function axisTitlesOf(spec: unknown): { x: string | null; y: string | null } {
  const first = plotsOf(spec, { encoding: {}, repeat: {}, plain: true })[0];
  return { x: first?.x[0] ?? null, y: first?.y[0] ?? null };
}
