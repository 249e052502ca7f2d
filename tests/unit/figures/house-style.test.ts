import { describe, expect, it } from "vitest";
import { applyHouseStyle, DEFAULT_HOUSE_STYLE, describeHouseStyle, panelLetter, readHouseStyle } from "@/lib/figures/house-style";

const spec = {
  config: { font: "Inter", axis: { labelFontSize: 7, titleFontSize: 8, domainColor: "#000000", grid: false }, line: { strokeWidth: 1 } },
  data: { name: "echo", values: [{ mark: { type: "line", strokeWidth: 9 } }] },
  layer: [
    { mark: { type: "point", size: 9 } },
    { mark: { type: "line", color: "#D55E00", strokeWidth: 1 } },
    { layer: [{ mark: { type: "line", strokeWidth: 0.8 } }, { mark: "line" }] },
  ],
};

describe("house style", () => {
  const style = { ...DEFAULT_HOUSE_STYLE, font: "Arimo" as const, labelPt: 6, titlePt: 7, axisLinePt: 0.4, dataLinePt: 0.5 };

  it("sets the fonts, sizes and axis lines in the config and keeps the spec's other settings", () => {
    const out = applyHouseStyle(spec, style);
    expect(out.config.font).toBe("Arimo");
    expect(out.config.axis).toEqual({
      labelFontSize: 6,
      titleFontSize: 7,
      labelFont: "Arimo",
      titleFont: "Arimo",
      domainColor: "#000000",
      grid: false,
      domainWidth: 0.4,
      tickWidth: 0.4,
    });
    expect((out.config as Record<string, unknown>).legend).toMatchObject({ labelFontSize: 6, titleFontSize: 7, labelFont: "Arimo" });
    expect(out.config.line).toEqual({ strokeWidth: 0.5 });
  });

  it("gives every line mark that sets its own width the house width, at any depth, but leaves data alone", () => {
    const out = applyHouseStyle(spec, style);
    expect(out.layer[1]).toEqual({ mark: { type: "line", color: "#D55E00", strokeWidth: 0.5 } });
    expect(out.layer[2]!.layer![0]).toEqual({ mark: { type: "line", strokeWidth: 0.5 } });
    expect(out.layer[2]!.layer![1]).toEqual({ mark: "line" }); // takes config.line
    expect(out.layer[0]).toEqual({ mark: { type: "point", size: 9 } });
    expect(out.data.values[0]!.mark.strokeWidth).toBe(9);
    expect(spec.layer[1]!.mark).toEqual({ type: "line", color: "#D55E00", strokeWidth: 1 }); // the stored spec is untouched
  });

  it("keeps each panel's own line widths when the style sets none", () => {
    const out = applyHouseStyle(spec, { ...style, dataLinePt: null });
    expect(out.layer[2]!.layer![0]).toEqual({ mark: { type: "line", strokeWidth: 0.8 } });
    expect(out.config.line).toEqual({ strokeWidth: 1 });
  });

  it("reads a stored style field by field: a bad or missing field falls back to its default", () => {
    expect(readHouseStyle(null)).toEqual(DEFAULT_HOUSE_STYLE);
    expect(readHouseStyle({ font: "Comic Sans", labelPt: 6, letterCase: "upper", extra: 1 })).toEqual({
      ...DEFAULT_HOUSE_STYLE,
      labelPt: 6,
      letterCase: "upper",
    });
  });

  it("letters and the one-line summary", () => {
    expect(panelLetter("c", { ...style, letterCase: "upper" })).toBe("C");
    expect(panelLetter("C", style)).toBe("c");
    expect(describeHouseStyle(DEFAULT_HOUSE_STYLE)).toBe("Inter, labels 7 pt, titles 8 pt, axes 0.6 pt, letters a 8 pt bold");
  });
});

describe("house style on screen", () => {
  it("names the font with same-metric fallbacks for the browser preview, the bare family for the server", () => {
    const style = { ...DEFAULT_HOUSE_STYLE, font: "Arimo" as const };
    const point: { mark: string; config?: unknown } = { mark: "point" };
    expect(applyHouseStyle(point, style, { browser: true }).config).toMatchObject({ font: "Arimo, Arial, Helvetica, sans-serif" });
    expect(applyHouseStyle(point, style).config).toMatchObject({ font: "Arimo" });
  });
});
