import { describe, expect, it } from "vitest";
import { formatWithUncertainty, headlineParameter, parameterRows, parameterSymbol, roundWithUncertainty, storedParameters } from "@/lib/figures/fit-value";

describe("formatWithUncertainty (GUM §7.2.6: one or two significant digits of uncertainty)", () => {
  it("keeps one digit of an uncertainty starting with 3–9 and rounds the value to it", () => {
    expect(formatWithUncertainty(38.73, 0.694)).toBe("38.7 ± 0.7");
    expect(formatWithUncertainty(2.8704, 0.0047)).toBe("2.870 ± 0.005");
  });
  it("keeps two digits when the uncertainty starts with 1 or 2", () => {
    expect(formatWithUncertainty(12.345, 0.0123)).toBe("12.345 ± 0.012");
    expect(formatWithUncertainty(1234.5, 23)).toBe("1235 ± 23");
    expect(formatWithUncertainty(0.5, 0.25)).toBe("0.50 ± 0.25");
  });
  it("decides again when rounding carries into a new leading digit", () => {
    expect(formatWithUncertainty(5.4321, 0.0961)).toBe("5.43 ± 0.10");
    expect(formatWithUncertainty(71.2, 9.7)).toBe("71 ± 10");
  });
  it("rounds to tens and hundreds when the uncertainty is large", () => {
    expect(formatWithUncertainty(1234.5, 56)).toBe("1230 ± 60");
    expect(formatWithUncertainty(98765, 432)).toBe("98800 ± 400");
  });
  it("writes negative values and a rounded-away sign plainly", () => {
    expect(formatWithUncertainty(-3.14159, 0.05)).toBe("-3.14 ± 0.05");
    expect(formatWithUncertainty(-0.0004, 0.3)).toBe("0.0 ± 0.3");
  });
  it("gives the value alone, four significant digits, without a usable uncertainty", () => {
    expect(formatWithUncertainty(2.870412, null)).toBe("2.87");
    expect(formatWithUncertainty(38.73, 0)).toBe("38.73");
    expect(roundWithUncertainty(12.5, Number.NaN)).toEqual({ value: "12.5", uncertainty: null });
  });
});

describe("parameterSymbol", () => {
  it("writes trailing digits as subscripts", () => {
    expect(parameterSymbol("T2")).toBe("T₂");
    expect(parameterSymbol("f0")).toBe("f₀");
    expect(parameterSymbol("T_1")).toBe("T₁");
    expect(parameterSymbol("amplitude")).toBe("amplitude");
  });
});

describe("parameterRows", () => {
  it("gives each parameter its text, a fixed one without uncertainty", () => {
    const rows = parameterRows("hahn_echo", [
      { name: "T2", value: 38.73, stderr: 0.694, unit: "µs" },
      { name: "n", value: 1.5, stderr: 0, unit: "", fixed: true },
    ]);
    expect(rows.map((r) => r.text)).toEqual(["T₂ = 38.7 ± 0.7 µs", "n = 1.5"]);
    expect(rows[0]).toMatchObject({ name: "T2", symbol: "T₂", value: 38.73, error: 0.694, unit: "µs", model: "hahn_echo" });
    expect(rows[1].error).toBeNull();
  });

  it("says a fitted parameter without a standard error is not determined by the data", () => {
    const rows = parameterRows("relaxation", [
      { name: "T1", value: 17.2, stderr: null, unit: "ms" },
      { name: "A", value: 0.01, stderr: 0.02, unit: "" },
    ]);
    expect(rows[0]!.text).toBe("T₁ = 17.2 ms (not determined by the data)");
    expect(rows[1]!.text).toBe("A = 0.010 ± 0.020"); // two digits of an uncertainty starting with 2
    expect(
      headlineParameter([
        { name: "T1", value: 17.2, stderr: null, unit: "ms" },
        { name: "A", value: 0.01, stderr: 0.02, unit: "" },
      ]),
    ).toBe("A");
  });
});

describe("storedParameters", () => {
  it("reads a stored result and leaves malformed entries out", () => {
    const result = { parameters: [{ name: "T2", value: 38.73, stderr: 0.694, unit: "µs", fixed: false }, { value: 3 }, null] };
    expect(storedParameters(result)).toEqual([{ name: "T2", value: 38.73, stderr: 0.694, unit: "µs", fixed: false }]);
    expect(storedParameters({})).toEqual([]);
  });
});

describe("headlineParameter", () => {
  it("offers the coherence time of an echo fit first", () => {
    expect(
      headlineParameter([
        { name: "S0", value: 0.1, stderr: 0.01, unit: "" },
        { name: "A", value: 0.9, stderr: 0.02, unit: "" },
        { name: "T2", value: 38.7, stderr: 0.7, unit: "µs" },
      ]),
    ).toBe("T2");
  });
  it("else the first parameter with an uncertainty", () => {
    expect(
      headlineParameter([
        { name: "a", value: 1, stderr: null, unit: "" },
        { name: "b", value: 2, stderr: 0.1, unit: "" },
      ]),
    ).toBe("b");
    expect(headlineParameter([])).toBeNull();
  });
});
