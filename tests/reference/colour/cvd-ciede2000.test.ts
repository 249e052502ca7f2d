// Colour science of the print check (lib/figures/print-check.ts) against published values and an
// independent computation: cvd_ciede2000.py beside this file (numpy; CIEDE2000 written from Sharma, Wu &
// Dalal 2005 and checked there against all 34 pairs of their Table 1), whose printed ΔE00 are pasted here.
import { differenceCiede2000, filterDeficiencyDeuter, filterDeficiencyProt, filterDeficiencyTrit } from "culori";
import { describe, expect, it } from "vitest";
import { cvdDeltaE, MACHADO_2009, MIN_CVD_DELTA_E00, type Deficiency } from "@/lib/figures/print-check";

const OKABE_ITO = ["#000000", "#E69F00", "#56B4E9", "#009E73", "#F0E442", "#0072B2", "#D55E00", "#CC79A7"];

describe("CIEDE2000 (culori) against Sharma, Wu & Dalal 2005, Table 1", () => {
  const de = differenceCiede2000();
  const lab = (l: number, a: number, b: number) => ({ mode: "lab65" as const, l, a, b });
  // [pair number, Lab 1, Lab 2, ΔE00] as printed in Table 1 (Color Res. Appl. 30(1):21–30).
  const pairs: Array<[number, [number, number, number], [number, number, number], number]> = [
    [1, [50, 2.6772, -79.7751], [50, 0, -82.7485], 2.0425],
    [7, [50, 0, 0], [50, -1, 2], 2.3669],
    [11, [50, 2.49, -0.001], [50, -2.49, 0.0011], 7.2195],
    [17, [50, 2.5, 0], [73, 25, -18], 27.1492],
    [25, [60.2574, -34.0099, 36.2677], [60.4626, -34.1751, 39.4387], 1.2644],
    [34, [2.0776, 0.0795, -1.135], [0.9033, -0.0636, -0.5514], 0.9082],
  ];
  for (const [n, a, b, expected] of pairs) {
    it(`pair ${n}: ΔE00 = ${expected}`, () => {
      expect(de(lab(...a), lab(...b))).toBeCloseTo(expected, 4);
    });
  }
});

describe("Machado, Oliveira & Fernandes 2009 matrices (severity 1.0)", () => {
  // culori ships the same published table (its filterDeficiency* apply it to whatever RGB triple they get):
  // feeding it the unit vectors reads its columns back, to compare with the literals written in print-check.ts.
  const filters: Record<Deficiency, ReturnType<typeof filterDeficiencyProt>> = {
    protanopia: filterDeficiencyProt(1),
    deuteranopia: filterDeficiencyDeuter(1),
    tritanopia: filterDeficiencyTrit(1),
  };
  for (const kind of Object.keys(filters) as Deficiency[]) {
    it(`${kind}: the literals equal the published table`, () => {
      for (let col = 0; col < 3; col++) {
        const unit = { mode: "rgb" as const, r: col === 0 ? 1 : 0, g: col === 1 ? 1 : 0, b: col === 2 ? 1 : 0 };
        const out = filters[kind](unit) as { r: number; g: number; b: number };
        expect([out.r, out.g, out.b].map((v) => Number(v.toFixed(6)))).toEqual(MACHADO_2009[kind].map((row) => row[col]));
      }
    });
  }
});

describe("ΔE00 as a dichromat sees it, against cvd_ciede2000.py", () => {
  it("Tableau's red and green (#D62728, #2CA02C) collapse under deuteranopia", () => {
    expect(cvdDeltaE("#D62728", "#2CA02C", "normal")).toBeCloseTo(71.8278, 2);
    expect(cvdDeltaE("#D62728", "#2CA02C", "deuteranopia")).toBeCloseTo(4.6117, 2);
    expect(cvdDeltaE("#D62728", "#2CA02C", "protanopia")).toBeCloseTo(24.9154, 2);
    expect(cvdDeltaE("#D62728", "#2CA02C", "tritanopia")).toBeCloseTo(65.2695, 2);
  });

  it("pure red and pure green stay apart by lightness even for a deuteranope (ΔE00 19.4)", () => {
    expect(cvdDeltaE("#FF0000", "#00FF00", "deuteranopia")).toBeCloseTo(19.4086, 2);
    expect(cvdDeltaE("#FF0000", "#00FF00", "protanopia")).toBeCloseTo(42.4234, 2);
  });

  it("Okabe & Ito's palette: the closest pairs, and every pair above the threshold under every deficiency", () => {
    expect(cvdDeltaE("#E69F00", "#CC79A7", "tritanopia")).toBeCloseTo(10.8688, 2); // orange vs reddish purple
    expect(cvdDeltaE("#E69F00", "#F0E442", "deuteranopia")).toBeCloseTo(11.6052, 2); // orange vs yellow
    expect(cvdDeltaE("#0072B2", "#D55E00", "deuteranopia")).toBeCloseTo(56.6377, 2); // blue vs vermillion, the templates' pair
    let least = Infinity;
    for (let i = 0; i < OKABE_ITO.length; i++)
      for (let j = i + 1; j < OKABE_ITO.length; j++)
        for (const kind of ["deuteranopia", "protanopia", "tritanopia"] as const) least = Math.min(least, cvdDeltaE(OKABE_ITO[i]!, OKABE_ITO[j]!, kind));
    expect(least).toBeCloseTo(10.8688, 2);
    expect(least).toBeGreaterThan(MIN_CVD_DELTA_E00);
  });
});
