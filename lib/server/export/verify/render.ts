/** The render check: the figure drawn again from the bundle's specs and rows, compared with figure.svg panel by panel. */
import "server-only";
import { strFromU8 } from "fflate";
import { type RowTable } from "@/lib/data/table-rows";
import { readHouseStyle } from "@/lib/figures/house-style";
import { DRAFT_MARK_TEXT, withDraftMark } from "../draft-mark";
import { BUNDLE_PATHS, type BundleRender } from "../bundle-layout";
import { drawFigure, figureLayout, figurePanelJobs } from "../render-figure";
import { type VerifyRow, readJson, short } from "./common";

/** SVG compared modulo line endings, whitespace between tags, and the names of element ids (numbered in order of appearance). */
function canonicalSvg(svg: string): string {
  const text = svg.replace(/\r\n?/g, "\n").replace(/>\s+</g, "><").trim();
  const names = new Map<string, string>();
  for (const m of text.matchAll(/\sid="([^"]+)"/g)) if (!names.has(m[1])) names.set(m[1], `id${names.size + 1}`);
  if (!names.size) return text;
  return text
    .replace(/(\sid=")([^"]+)"/g, (_, a: string, id: string) => `${a}${names.get(id)}"`)
    .replace(/url\(\s*#([^)\s]+)\s*\)/g, (m, id: string) => (names.has(id) ? `url(#${names.get(id)})` : m))
    .replace(/((?:xlink:)?href=")#([^"]+)"/g, (m, a: string, id: string) => (names.has(id) ? `${a}#${names.get(id)}"` : m));
}

/** The composed figure cut at each panel group: the part before the first panel, then one part per panel letter. */
function panelParts(svg: string): { head: string; panels: Map<string, string> } {
  const pieces = svg.split(/(?=<g class="panel panel-)/);
  const panels = new Map<string, string>();
  for (const piece of pieces.slice(1)) {
    const letter = /^<g class="panel panel-([^"]*)"/.exec(piece)![1];
    panels.set(letter, piece);
  }
  return { head: pieces[0] ?? "", panels };
}

export async function renderRows(
  record: BundleRender,
  panelTables: Map<string, Record<string, RowTable>>,
  files: Record<string, Uint8Array>,
): Promise<VerifyRow[]> {
  const out: VerifyRow[] = [];
  const stored = files[BUNDLE_PATHS.figureSvg];
  if (!stored) return [{ item: BUNDLE_PATHS.figureSvg, check: "render", match: false, detail: "missing from the bundle" }];
  const style = readHouseStyle(record.houseStyle);
  const panels = [];
  for (const p of record.panels) {
    const spec = readJson(files, p.spec);
    const data = panelTables.get(p.letter);
    if (!spec.ok || !data) {
      out.push({ item: `panel ${p.letter}`, check: "render", match: false, detail: spec.ok ? `${p.data} is missing or unreadable` : spec.error });
      continue;
    }
    panels.push({ letter: p.letter, spec: spec.value, data, span: p.span });
  }
  if (out.length) return out;
  const jobs = figurePanelJobs(panels, { columns: record.columns, shareYTitles: record.shareYTitles === true }, style);
  let drawn: string;
  let reduced: boolean;
  try {
    const again = await drawFigure(jobs, figureLayout(record.columns, style), record.widthMm);
    drawn = again.figure.svg;
    reduced = again.reduced;
  } catch (err) {
    return [{ item: BUNDLE_PATHS.figureSvg, check: "render", match: false, detail: `could not be drawn again: ${(err as Error).message}` }];
  }
  const bundled = strFromU8(stored);
  // An export of a figure not signed off carries the draft mark; drawn again the same way when figure.svg has it.
  const marked = bundled.includes(DRAFT_MARK_TEXT);
  const candidate = canonicalSvg(marked ? withDraftMark(drawn, record.figureHash) : drawn);
  const actual = canonicalSvg(bundled);
  const a = panelParts(candidate);
  const b = panelParts(actual);
  for (const [i, p] of record.panels.entries()) {
    const letter = jobs[i].letter;
    const mine = a.panels.get(letter);
    const theirs = b.panels.get(letter);
    const item = `panel ${p.letter}`;
    if (theirs === undefined) out.push({ item, check: "render", match: false, detail: `figure.svg has no panel ${letter}` });
    else if (mine === theirs)
      out.push({ item, check: "render", match: true, detail: `drawn again from ${p.spec} and ${p.data}: identical SVG (${mine.length} characters)` });
    else
      out.push({
        item,
        check: "render",
        match: false,
        detail: `drawn again from ${p.spec} and ${p.data}: SVG differs at character ${firstDifference(mine ?? "", theirs)}`,
      });
  }
  const same = candidate === actual;
  out.push({
    item: BUNDLE_PATHS.figureSvg,
    check: "render",
    match: same,
    detail: `${same ? "identical SVG" : `SVG differs at character ${firstDifference(candidate, actual)}`} (${record.panels.length} panels, ${record.widthMm} mm wide${marked ? `, with the draft mark for figure hash ${short(record.figureHash)}…` : ""}${reduced ? ", long series reduced as the export does" : ""})`,
  });
  return out;
}

function firstDifference(a: string, b: string): number {
  const n = Math.min(a.length, b.length);
  for (let i = 0; i < n; i++) if (a[i] !== b[i]) return i + 1;
  return n + 1;
}
