import { afterAll, describe, expect, it } from "vitest";
import { renderFigureInWorker, stopRenderWorkers, type FigurePanelJob } from "@/lib/server/render/render-in-worker";
import { alignmentPadding } from "@/lib/server/render/worker/align-core.mjs";

afterAll(stopRenderWorkers);

/** A single-view scatter whose y values (and so tick labels) and titles are chosen per panel. */
function panel(letter: string, ys: number[], yTitle: string, xTitle: string | null, span = 1): FigurePanelJob {
  return {
    letter,
    span,
    data: { d: ys.map((y, i) => ({ x: i + 1, y })) },
    spec: {
      width: 200,
      height: 140,
      padding: 2,
      data: { name: "d" },
      mark: "point",
      encoding: {
        x: { field: "x", type: "quantitative", title: xTitle },
        y: { field: "y", type: "quantitative", title: yTitle, scale: { zero: false } },
      },
    },
  };
}

/**
 * Plotting areas read back from the composed SVG itself: each panel is a nested <svg x y> whose
 * Vega drawing is translated to the plot's origin (padding and axes), then its root frame group,
 * whose background path "M0.5,0.5hWvH…" spans the plot; positions in figure pt.
 */
function plotBoxes(svg: string) {
  const boxes = new Map<string, { left: number; top: number; right: number; bottom: number }>();
  const re =
    /<g class="panel panel-(\w)">[^]*?<svg x="([\d.]+)" y="([\d.]+)"[^>]*>[^]*?transform="translate\(([\d.]+),([\d.]+)\)"><g class="mark-group role-frame root"[^>]*><g transform="translate\(([\d.]+),([\d.]+)\)"><path class="background"[^>]*d="M[\d.]+,[\d.]+h([\d.]+)v([\d.]+)/g;
  for (const m of svg.matchAll(re)) {
    const [, letter, sx, sy, ox, oy, fx, fy, w, h] = m;
    const left = Number(sx) + Number(ox) + Number(fx);
    const top = Number(sy) + Number(oy) + Number(fy);
    boxes.set(letter!, { left, top, right: left + Number(w), bottom: top + Number(h) });
  }
  return boxes;
}

describe("axes lined up across a figure's panels", () => {
  // a: narrow labels (1–3), b: wide labels (100000–300000) and no x title; c below a: wide labels; d below b.
  const panels = [
    panel("a", [1, 2, 3], "signal", "τ (µs)"),
    panel("b", [100000, 200000, 300000], "counts", null),
    panel("c", [123456, 234567, 345678], "PL (kcts/s)", "x (µm)"),
    panel("d", [0.1, 0.2, 0.3], "contrast", "f (MHz)"),
  ];

  it("plots in a column start at one x, plots in a row at one top and one bottom", async () => {
    const fig = await renderFigureInWorker(panels, { columns: 2 }, 183);
    const box = plotBoxes(fig.svg);
    expect([...box.keys()].sort()).toEqual(["a", "b", "c", "d"]);
    const near = (a: number, b: number) => expect(Math.abs(a - b)).toBeLessThan(0.3); // pt, about 0.1 mm
    near(box.get("a")!.left, box.get("c")!.left - 0); // column 1
    near(box.get("b")!.left, box.get("d")!.left); // column 2
    near(box.get("a")!.top, box.get("b")!.top); // row 1
    near(box.get("a")!.bottom, box.get("b")!.bottom); // row 1: b has no x title, yet its plot ends where a's does
    near(box.get("c")!.top, box.get("d")!.top); // row 2
    near(box.get("c")!.bottom, box.get("d")!.bottom);
  });

  it("without alignment the same figure's edges differ by whole label widths (the check above can fail)", async () => {
    const fig = await renderFigureInWorker(panels, { columns: 2, alignAxes: false }, 183);
    const box = plotBoxes(fig.svg);
    expect(box.size).toBe(4);
    expect(Math.abs(box.get("a")!.left - box.get("c")!.left)).toBeGreaterThan(10);
    expect(Math.abs(box.get("a")!.bottom - box.get("b")!.bottom)).toBeGreaterThan(5);
  });
});

describe("alignment padding", () => {
  it("grows each short margin to the widest of its column and row, hand-worked", () => {
    const cells = [
      { row: 0, col: 0, span: 1 },
      { row: 0, col: 1, span: 1 },
      { row: 1, col: 0, span: 2 },
    ];
    const pad = alignmentPadding(
      [
        { plot: { left: 30, top: 5, right: 2, bottom: 25 }, height: 140 },
        { plot: { left: 50, top: 8, right: 2, bottom: 20 }, height: 140 },
        { plot: { left: 42, top: 5, right: 2, bottom: 25 }, height: 90 },
      ],
      cells,
    );
    expect(pad).toEqual([
      { left: 12, top: 3, bottom: 0 }, // column 0 widest is 42 (the spanning panel); row 0 top 8
      { left: 0, top: 0, bottom: 5 },
      { left: 0, top: 0, bottom: 0 },
    ]);
  });

  it("leaves bottoms alone in a row of panels of different heights, and skips panels without a plot", () => {
    const pad = alignmentPadding(
      [
        { plot: { left: 30, top: 5, right: 2, bottom: 25 }, height: 140 },
        { plot: { left: 50, top: 5, right: 2, bottom: 10 }, height: 100 },
        { plot: null, height: 100 },
      ],
      [
        { row: 0, col: 0, span: 1 },
        { row: 0, col: 1, span: 1 },
        { row: 0, col: 2, span: 1 },
      ],
    );
    expect(pad).toEqual([
      { left: 0, top: 0, bottom: 0 },
      { left: 0, top: 0, bottom: 0 },
      { left: 0, top: 0, bottom: 0 },
    ]);
  });
});
