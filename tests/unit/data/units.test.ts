import { describe, expect, it } from "vitest";
import { parseHeaderUnit, toSIFactor } from "@/lib/data/units";

describe("parseHeaderUnit", () => {
  it.each([
    ["time (µs)", "time", "µs"],
    ["time [us]", "time", "µs"],
    ["f / MHz", "f", "MHz"],
    ["B (mT)", "B", "mT"],
    ["tau (\u03BCs)", "tau", "µs"],
    ["freq_MHz", "freq", "MHz"],
    ["f/GHz", "f", "GHz"],
    ["PL (kcounts/s)", "PL", "kcps"],
    ["signal [a.u.]", "signal", "a.u."],
    ["P (dBm)", "P", "dBm"],
    ["contrast (%)", "contrast", "%"],
    ["counts/s", "counts/s", null],
    ["run_id", "run_id", null],
    ["counts", "counts", null],
    ["x ()", "x", null],
    ["(us)", "(us)", null],
  ])("%s → %s, %s", (header, name, unit) => {
    expect(parseHeaderUnit(header)).toEqual({ name, unit });
  });
});

describe("toSIFactor", () => {
  it.each([
    ["s", "s", 1],
    ["ns", "s", 1e-9],
    ["us", "s", 1e-6],
    ["µs", "s", 1e-6],
    ["\u03BCs", "s", 1e-6],
    ["ms", "s", 1e-3],
    ["ps", "s", 1e-12],
    ["Hz", "Hz", 1],
    ["kHz", "Hz", 1e3],
    ["MHz", "Hz", 1e6],
    ["GHz", "Hz", 1e9],
    ["T", "T", 1],
    ["mT", "T", 1e-3],
    ["uT", "T", 1e-6],
    ["G", "T", 1e-4],
    ["nm", "m", 1e-9],
    ["m", "m", 1],
    ["counts", "counts", 1],
    ["kcounts", "counts", 1e3],
    ["cps", "cps", 1],
    ["kcps", "cps", 1e3],
    ["Mcps", "cps", 1e6],
    ["counts/s", "cps", 1],
    ["%", "1", 0.01],
    ["mV", "V", 1e-3],
    ["nA", "A", 1e-9],
    ["dBm", "dBm", 1],
  ])("%s → %s × %s", (unit, siUnit, factor) => {
    const r = toSIFactor(unit);
    expect(r?.siUnit).toBe(siUnit);
    expect(r?.factor).toBeCloseTo(factor, 20);
    expect(Math.abs((r?.factor ?? 0) / factor - 1)).toBeLessThan(1e-12);
  });

  it("returns null for units it does not know", () => {
    for (const u of ["a.u.", "K", "mdBm", "k%", "", "furlong"]) expect(toSIFactor(u)).toBeNull();
  });
});
