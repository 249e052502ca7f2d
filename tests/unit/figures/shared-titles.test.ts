import { describe, expect, it } from "vitest";
import { shareYTitles, withoutYTitle, yTitlesLeftOut } from "@/lib/figures/shared-titles";

const scatter = (yTitle: string | undefined) => ({
  data: { name: "d" },
  mark: "point",
  encoding: { x: { field: "x", type: "quantitative", title: "τ (µs)" }, y: { field: "y", type: "quantitative", ...(yTitle ? { title: yTitle } : {}) } },
});

describe("one y-axis title per row", () => {
  it("leaves out a later panel's y title when it repeats the first of its row, and nothing else", () => {
    const specs = [scatter("T₂ (µs)"), scatter("T₂ (µs)"), scatter("contrast"), scatter("T₂ (µs)"), scatter("T₂ (µs)")];
    const out = shareYTitles(specs, [0, 0, 0, 1, 1]);
    const titles = out.map((s) => s.encoding.y.title);
    expect(titles).toEqual(["T₂ (µs)", null, "contrast", "T₂ (µs)", null]);
    expect(out.map((s) => s.encoding.x.title)).toEqual(Array(5).fill("τ (µs)"));
    expect(specs[1]!.encoding.y.title).toBe("T₂ (µs)"); // the stored spec is untouched
  });

  it("reaches y encodings in layers and concats, but not a residual strip titled differently", () => {
    const stacked = {
      vconcat: [
        {
          layer: [
            { mark: "point", encoding: { y: { field: "s", title: "signal" } } },
            { mark: "line", encoding: { y: { field: "f", title: "signal" } } },
          ],
        },
        { mark: "point", encoding: { y: { field: "r", title: "residual" } } },
      ],
    };
    const out = withoutYTitle(stacked, "signal");
    expect(out.vconcat[0]!.layer![0]!.encoding.y.title).toBeNull();
    expect(out.vconcat[0]!.layer![1]!.encoding.y.title).toBeNull();
    expect(out.vconcat[1]!.encoding!.y.title).toBe("residual");
  });

  it("the preview leaves out what the export leaves out: rows from the panels' spans, a loading panel keeps its place", () => {
    // Two columns: a (1) and b (1) share row 0; c spans both (row 1); d (1) and e (1) share row 2.
    const panels = [
      { span: 1, spec: scatter("T₂ (µs)") },
      { span: 1, spec: scatter("T₂ (µs)") },
      { span: 2, spec: scatter("T₂ (µs)") },
      { span: 1, spec: undefined },
      { span: 1, spec: scatter("contrast") },
    ];
    expect(yTitlesLeftOut(panels, 2)).toEqual([undefined, "T₂ (µs)", undefined, undefined, undefined]);
    expect(yTitlesLeftOut(panels, 1)).toEqual([undefined, undefined, undefined, undefined, undefined]);
  });
});
