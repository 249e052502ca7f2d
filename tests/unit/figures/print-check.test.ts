// The print check's rules (lib/figures/print-check.ts) with seeded faults: a 4 pt label, a missing unit, a
// red/green pair that collapses under deuteranopia, undefined error bars, grouped data without n, a 250 dpi
// export, an old data version; and what passes: the demo templates, Okabe & Ito's palette.
import { describe, expect, it } from "vitest";
import { composeFigureCore } from "@/lib/server/render/worker/compose-core.mjs";
import {
  axisTitleProblem,
  checkAxes,
  checkColourPairs,
  checkErrorBars,
  checkFigureSize,
  checkGroupN,
  checkLatestVersions,
  checkRasterDpi,
  checkTextSizes,
  definesErrorBars,
  keepsVersion,
  printCheckFailures,
  readFigureSvg,
  specAxes,
  specGroupsData,
  transformScale,
  type PanelWords,
} from "@/lib/figures/print-check";
import { getTemplate } from "@/lib/figures/templates";

/** A panel as Vega's SVG renderer writes it: natural size in pt, axis text in px, one data mark group. */
function panelSvg(o: { width: number; height: number; labelPx: number; colours?: string[]; extra?: string }) {
  const marks = (o.colours ?? ["#0072B2"]).map((c, i) => `<path transform="translate(${10 + i * 5},20)" d="M1,0A1,1,0,1,1,-1,0Z" fill="${c}"/>`).join("");
  return (
    `<svg xmlns="http://www.w3.org/2000/svg" width="${o.width}" height="${o.height}" viewBox="0 0 ${o.width} ${o.height}">` +
    `<g class="mark-group role-axis"><g class="mark-text role-axis-label"><text transform="translate(0,11)" font-family="Inter" font-size="${o.labelPx}px">100</text></g>` +
    `<g class="mark-text role-axis-title"><text transform="translate(-24,48.5) rotate(-90)" font-size="8px">τ (µs)</text></g></g>` +
    `<g class="mark-symbol role-mark layer_0_marks">${marks}</g>` +
    `<g class="mark-rule role-mark layer_1_marks"><line x2="100" stroke="#777777"/></g>` +
    `<g class="mark-symbol role-legend-symbol"><path d="M0,0Z" fill="#FF00FF"/></g>` +
    (o.extra ?? "") +
    `</svg>`
  );
}

const compose = (panels: Array<{ letter: string; svg: string; span?: number }>, columns: number, widthMm: number) =>
  composeFigureCore(panels, { columns, alignAxes: false }, widthMm);

describe("text sizes read from the composed SVG", () => {
  it("a panel drawn at its cell width keeps its sizes: 7 px labels print at 7 pt, the letter at 8 pt", () => {
    // 89 mm = 252.283 pt: one column, the panel's natural width equals the cell, scale 1.
    const fig = compose([{ letter: "a", svg: panelSvg({ width: 252.283, height: 150, labelPx: 7 }) }], 1, 89);
    const { texts } = readFigureSvg(fig.svg);
    expect(texts.map((t) => [t.panel, t.text, Number(t.pt.toFixed(3))])).toEqual([
      ["a", "a", 8],
      ["a", "100", 7],
      ["a", "τ (µs)", 8],
    ]);
    expect(checkTextSizes(texts, 89)).toMatchObject({ ok: true, detail: "smallest text 7.0 pt" });
  });

  it("a 4 pt label fails, named with its panel and size", () => {
    const fig = compose([{ letter: "a", svg: panelSvg({ width: 252.283, height: 150, labelPx: 4 }) }], 1, 89);
    const item = checkTextSizes(readFigureSvg(fig.svg).texts, 89);
    expect(item.ok).toBe(false);
    expect(item.problems).toEqual(["“100” in panel a prints at 4.0 pt"]);
  });

  it("a panel drawn wider than its cell shrinks: 7 px in a 400 pt panel squeezed into 252.283 pt prints at 4.4 pt", () => {
    const fig = compose([{ letter: "b", svg: panelSvg({ width: 400, height: 200, labelPx: 7 }) }], 1, 89);
    const small = readFigureSvg(fig.svg).texts.find((t) => t.text === "100")!;
    expect(small.pt).toBeCloseTo((7 * 252.283) / 400, 2); // 4.415 pt
    expect(checkTextSizes(readFigureSvg(fig.svg).texts, 89).problems).toEqual(["“100” in panel b prints at 4.4 pt"]);
  });

  it("scale transforms count, translate and rotate do not; entities are decoded", () => {
    expect(transformScale("translate(3,4) rotate(-90)")).toBe(1);
    expect(transformScale("scale(0.5)")).toBe(0.5);
    expect(transformScale("matrix(2,0,0,2,10,10) scale(0.25,1)")).toBeCloseTo(1, 12);
    const fig = compose(
      [
        {
          letter: "a",
          svg: panelSvg({ width: 252.283, height: 150, labelPx: 7, extra: `<g transform="scale(0.5)"><text font-size="9px">n &lt; 5</text></g>` }),
        },
      ],
      1,
      89,
    );
    expect(readFigureSvg(fig.svg).texts.find((t) => t.text === "n < 5")!.pt).toBeCloseTo(4.5, 4); // the root's viewBox is written to 3 decimals of a pt
  });
});

describe("figure size", () => {
  it("within its width and maximum height, or the reason", () => {
    expect(checkFigureSize({ widthMm: 183, heightMm: 124.4, targetWidthMm: 183, maxHeightMm: 170 }).ok).toBe(true);
    expect(checkFigureSize({ widthMm: 183, heightMm: 181.2, targetWidthMm: 183, maxHeightMm: 170 }).problems).toEqual([
      "the figure is 181.2 mm tall, above its maximum of 170 mm",
    ]);
  });
});

describe("axis titles and units", () => {
  it("the rule: a unit in parentheses after a space, or a dimensionless last word; categories need a title only", () => {
    const q = (title: string | null) => axisTitleProblem({ channel: "y", title, type: "quantitative" });
    expect(q("τ (µs)")).toBeNull();
    expect(q("PL (norm.)")).toBeNull();
    expect(q("signal (a.u.)")).toBeNull();
    expect(q("coherence")).toBeNull();
    expect(q("normalised contrast")).toBeNull();
    expect(q("signal")).toMatch(/^the y axis “signal” has no unit in parentheses/);
    expect(q("count rate")).toMatch(/no unit/); // a rate has a unit even though "count" alone has none
    expect(q("g²(τ)")).toMatch(/no unit/); // an argument, not a unit
    expect(q(null)).toBe("the y axis has no title");
    expect(axisTitleProblem({ channel: "x", title: "sample group", type: "nominal" })).toBeNull();
    expect(axisTitleProblem({ channel: "x", title: null, type: "nominal" })).toBe("the x axis has no title");
  });

  it("the demo templates pass: the decay curve's hidden upper x axis needs no title, the residual strip's does", () => {
    const decay = getTemplate("decay-curve")!.build({ sigmaField: "sigma" } as never);
    expect(specAxes(decay)).toEqual([
      { channel: "y", title: "coherence", type: "quantitative" },
      { channel: "x", title: "τ (µs)", type: "quantitative" },
      { channel: "y", title: "residual", type: "quantitative" },
    ]);
    const strip = getTemplate("group-strip")!.build({} as never);
    const spectrum = getTemplate("spectrum")!.build({ yUnit: "norm." } as never);
    expect(
      checkAxes([
        { letter: "a", spec: decay },
        { letter: "b", spec: strip },
        { letter: "c", spec: spectrum },
      ]),
    ).toMatchObject({ ok: true, problems: [] });
  });

  it("a missing unit and an untitled axis fail, per panel", () => {
    const spec = {
      mark: "point",
      encoding: { x: { field: "tau", type: "quantitative" }, y: { field: "signal", type: "quantitative", title: "signal" } },
    };
    expect(checkAxes([{ letter: "b", spec }]).problems).toEqual([
      "panel b: the x axis has no title",
      "panel b: the y axis “signal” has no unit in parentheses — write “signal (unit)”, or “(norm.)” / “(a.u.)” for a dimensionless one",
    ]);
  });
});

describe("data colours under colour-vision deficiencies", () => {
  const panel = (letter: string, colours: string[]) =>
    readFigureSvg(compose([{ letter, svg: panelSvg({ width: 252.283, height: 150, labelPx: 7, colours }) }], 1, 89).svg).marks;

  it("reads the data marks' colours only: not the grey rule, the axes or the legend", () => {
    expect(panel("a", ["#0072B2", "#D55E00"])).toEqual([{ panel: "a", colours: ["#0072B2", "#D55E00"], gradient: false }]);
  });

  it("the Okabe–Ito palette passes: 28 pairs", () => {
    const all = ["#000000", "#E69F00", "#56B4E9", "#009E73", "#F0E442", "#0072B2", "#D55E00", "#CC79A7"];
    expect(checkColourPairs(panel("a", all))).toMatchObject({ ok: true, problems: [], detail: "28 colour pairs" });
  });

  it("Tableau's red and green fail under deuteranopia (ΔE00 4.6, cvd_ciede2000.py)", () => {
    const item = checkColourPairs(panel("c", ["#D62728", "#2CA02C"]));
    expect(item.ok).toBe(false);
    expect(item.problems).toEqual(["panel c: #2ca02c and #d62728 differ by ΔE00 4.6 under deuteranopia (at least 10)"]);
  });

  it("many colours in one mark group are a continuous scale, not compared pairwise", () => {
    const ramp = Array.from({ length: 20 }, (_, i) => `rgb(${i * 10}, ${i * 5}, 90)`);
    expect(checkColourPairs(panel("a", ramp))).toMatchObject({ ok: true, detail: "0 colour pairs; continuous colour scale in panel a not compared pairwise" });
  });
});

const words = (over: Partial<PanelWords>): PanelWords => ({ letter: "a", spec: {}, words: [], headers: [], drawn: [], ...over });

describe("error bars say what they are", () => {
  const decay = getTemplate("decay-curve")!.build({ sigmaField: "sigma" } as never);

  it("definitions the rule accepts, and “± σ” alone not", () => {
    for (const t of ["mean ± sd", "error bars: one standard deviation", "± s.e.m. of 20 blocks", "95% CI", "median and IQR", "SEM"])
      expect(definesErrorBars(t), t).toBe(true);
    for (const t of ["log τ axis, ± σ bars", "the second sweep", "used"]) expect(definesErrorBars(t), t).toBe(false);
  });

  it("σ bars from a column fail unless the words or the file's header define the column", () => {
    const bare = checkErrorBars([words({ spec: decay, words: ["Echo of NV09, ± σ bars"] })]);
    expect(bare.ok).toBe(false);
    expect(bare.problems[0]).toMatch(/^panel a draws error bars but does not say what they are/);
    // The demo files' header: "# sigma: standard error of the mean over 20 blocks".
    expect(checkErrorBars([words({ spec: decay, headers: [{ sigma: "standard error of the mean over 20 blocks" }] })]).ok).toBe(true);
    expect(checkErrorBars([words({ spec: decay, words: ["bars: 1 s.d. over 20 blocks"] })]).ok).toBe(true);
  });

  it("a panel without error bars has nothing to define", () => {
    expect(checkErrorBars([words({ spec: getTemplate("spectrum")!.build({} as never) })])).toMatchObject({ ok: true, detail: "no error bars" });
  });
});

describe("n for grouped data", () => {
  const strip = getTemplate("group-strip")!.build({} as never);

  it("the strip plot summarises groups; the scale bar's min/max of the PL map does not", () => {
    expect(specGroupsData(strip)).toBe(true);
    expect(specGroupsData(getTemplate("pl-map")!.build({} as never))).toBe(false);
    expect(specGroupsData(getTemplate("decay-curve")!.build({ sigmaField: "sigma" } as never))).toBe(false);
  });

  it("n drawn in the panel or written in its words passes; otherwise it fails", () => {
    expect(checkGroupN([words({ spec: strip, drawn: ["n = 4", "n = 4", "n = 4"] })]).ok).toBe(true);
    expect(checkGroupN([words({ spec: strip, words: ["T2 by group, N = 12 centres"] })]).ok).toBe(true);
    expect(checkGroupN([words({ letter: "b", spec: strip, drawn: ["20", "40"] })]).problems).toEqual([
      "panel b summarises groups but does not state n: draw “n = …” per group or write it in the panel's description",
    ]);
  });
});

describe("raster resolution and data versions", () => {
  it("300, 600 and 1200 dpi pass; a 250 dpi choice fails", () => {
    expect(checkRasterDpi([300, 600, 1200]).ok).toBe(true);
    expect(checkRasterDpi([250, 300]).problems).toEqual(["raster exports accept 250 dpi, below 300"]);
  });

  it("an older version fails unless the revision message keeps it on purpose", () => {
    const old = { panelId: "p3", panel: "c", name: "spectrum", dataset: "PL spectrum", number: 1, latest: 2, viaAnalysis: false, message: "first cut" };
    expect(checkLatestVersions([old]).problems).toEqual([
      "panel c: “spectrum” is bound to “PL spectrum” version 1, but version 2 is the latest — rebind it, or keep version 1 on purpose with a reason (saved as a revision note: “keep version 1: …”)",
    ]);
    // The same old version bound twice in one panel is offered for keeping once.
    expect(checkLatestVersions([old, { ...old, name: "spectrum-fit", viaAnalysis: true }]).keep).toEqual([
      { panelId: "p3", panel: "c", dataset: "PL spectrum", number: 1, latest: 2 },
    ]);
    expect(keepsVersion("Keep version 1: the dark-subtracted version 2 hides the NV⁰ line", 1)).toBe(true);
    expect(keepsVersion("keep v2", 1)).toBe(false);
    const kept = checkLatestVersions([{ ...old, message: "keeping v1 on purpose (raw counts)" }]);
    expect(kept).toMatchObject({ ok: true });
    expect(kept.keep).toBeUndefined();
    expect(checkLatestVersions([{ ...old, number: 2 }]).ok).toBe(true);
  });
});

describe("failures as lines for the sign-off", () => {
  it("one line per problem, prefixed with its rule", () => {
    const check = { ok: false, figureHash: "f".repeat(64), items: [checkRasterDpi([300]), checkRasterDpi([250])] };
    expect(printCheckFailures(check)).toEqual(["Raster exports at least 300 dpi: raster exports accept 250 dpi, below 300"]);
  });
});
