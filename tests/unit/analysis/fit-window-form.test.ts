import { describe, expect, it } from "vitest";
import { windowDraft, windowRange } from "@/components/analysis/fit-window";

describe("the typed fit window → options.xRange", () => {
  it("both fields blank: every point (no xRange)", () => {
    expect(windowRange({ from: "", to: " " })).toEqual({});
  });

  it("two numbers, the first below the second: the window", () => {
    expect(windowRange({ from: "2", to: "400" })).toEqual({ range: [2, 400] });
    expect(windowRange({ from: "2745.5", to: "2.76e3" })).toEqual({ range: [2745.5, 2760] });
  });

  it("refuses one end alone, text, and a window that runs backwards, naming the field", () => {
    expect(windowRange({ from: "2", to: "" })).toEqual({ error: "Fit window: give both “Fit from” and “Fit to” (or leave both blank for every point)." });
    expect(windowRange({ from: "two", to: "4" })).toEqual({ error: "Fit from: “two” is not a number." });
    expect(windowRange({ from: "2", to: "x" })).toEqual({ error: "Fit to: “x” is not a number." });
    expect(windowRange({ from: "400", to: "2" })).toEqual({ error: "Fit window: “Fit from” must be below “Fit to”." });
    expect(windowRange({ from: "4", to: "4" })).toEqual({ error: "Fit window: “Fit from” must be below “Fit to”." });
  });

  it("a stored run's window goes back into the fields as typed numbers", () => {
    expect(windowDraft([2745, 2760])).toEqual({ from: "2745", to: "2760" });
    expect(windowDraft(undefined)).toEqual({ from: "", to: "" });
    expect(windowRange(windowDraft([0.5, 12.25]))).toEqual({ range: [0.5, 12.25] });
  });
});
