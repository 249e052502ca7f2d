// Worked examples 1–5 of REFERENCES.md, checked through the calculators (practical units) to the
// digits given there. All computed with CODATA 2018 constants and g = 2.0028.
import { describe, expect, it } from "vitest";
import { listCalculators, runCalculator } from "@/lib/physics/calculators";
import { pointDipoleField } from "@/lib/physics/dipole";
import { odmrResonances } from "@/lib/physics/odmr";
import { expectDigits } from "./expect-digits";

const out = (id: string, inputs: Record<string, number>) => runCalculator(id, inputs).outputs;

describe("1. point-dipole field of one proton (Jackson, Classical Electrodynamics, eq. 5.56)", () => {
  it("d = 3 nm: 52.24 nT equatorial, 104.5 nT on axis", () => {
    expectDigits(out("proton-dipole-field", { d: 3, theta: 90 }).B, "52.24"); // Jackson eq. 5.56, μp = ħγp/2
    expectDigits(out("proton-dipole-field", { d: 3, theta: 0 }).B, "104.5"); // Jackson eq. 5.56
  });

  it("d = 10 nm: 1.411 nT equatorial, 2.821 nT on axis", () => {
    expectDigits(out("proton-dipole-field", { d: 10, theta: 90 }).B, "1.411"); // Jackson eq. 5.56
    expectDigits(out("proton-dipole-field", { d: 10, theta: 0 }).B, "2.821"); // Jackson eq. 5.56
  });

  it("SI pure function agrees (52.24 nT at 3 nm, equator)", () => {
    expectDigits(pointDipoleField(3e-9, Math.PI / 2).magnitude * 1e9, "52.24"); // Jackson eq. 5.56
  });
});

describe("2. ODMR with the field along the NV axis (Acosta et al. 2010; Loubser & van Wyk 1978, from memory)", () => {
  it("B = 5 mT → f₋ = 2729.84 MHz, f₊ = 3010.16 MHz", () => {
    const r = out("odmr-resonances", { B: 5, D: 2870 });
    expectDigits(r.f_minus, "2729.84"); // REFERENCES.md item 2, f± = D ± γB
    expectDigits(r.f_plus, "3010.16"); // REFERENCES.md item 2
    expectDigits(odmrResonances(5e-3).fMinus / 1e6, "2729.84"); // same, SI function with default D
  });

  it("f₋ = 2750, f₊ = 2990 MHz → B = 4.2809 mT, D = 2870 MHz", () => {
    const r = out("odmr-field-from-pair", { f_minus: 2750, f_plus: 2990 });
    expectDigits(r.B, "4.2809"); // REFERENCES.md item 2, B = (f₊ − f₋)/(2γ)
    expectDigits(r.D, "2870"); // REFERENCES.md item 2, D = (f₊ + f₋)/2
  });

  it("single line B = (D − f₋)/γ is valid only below D/γ = 102.38 mT", () => {
    const { outputs, warnings } = runCalculator("odmr-field-from-single-line", { f_minus: 2750, D: 2870 });
    expectDigits(outputs.B, "4.2809"); // REFERENCES.md item 2, same field from one line
    expectDigits(outputs.B_limit, "102.38"); // REFERENCES.md item 2, D/γ
    expect(warnings.join(" ")).toContain("102.38 mT");
  });
});

describe("3. Larmor frequency ↔ field (CODATA 2018 ¹H; IUPAC 2001 ¹³C, ¹⁹F)", () => {
  it("¹H at 0.1 T: 4.2577 MHz; 2.5 MHz ↔ 58.716 mT", () => {
    expectDigits(out("larmor-frequency", { B: 100 }).f_1H, "4.2577"); // CODATA 2018 γp/2π
    expectDigits(out("larmor-field", { f: 2.5 }).B_1H, "58.716"); // CODATA 2018 γp/2π
  });

  it("¹³C at 0.3 T: 3.2125 MHz; ¹⁹F at 0.3 T: 12.023 MHz", () => {
    const r = out("larmor-frequency", { B: 300 });
    expectDigits(r.f_13C, "3.2125"); // IUPAC 2001, Harris et al.
    expectDigits(r.f_19F, "12.023"); // IUPAC 2001, Harris et al.
  });

  it("dynamical-decoupling dip at τ = 1/(2f)", () => {
    // REFERENCES.md item 3: τ = 1/(2f); 4.2577478518 MHz → 117.433 ns
    expectDigits(out("decoupling-dip", { f: 4.2577478518 }).tau, "117.433");
    expect(out("decoupling-dip", { f: 2.5 }).tau).toBeCloseTo(200, 10); // 1/(2 · 2.5 MHz) = 200 ns exactly
  });
});

describe("4. NV-NMR B_rms of a proton layer (Pham et al., PRB 93, 045425 (2016); Staudacher et al., Science 339, 561 (2013); printed form from memory)", () => {
  it("ρ = 6.7e28 m⁻³, d = 10 nm → 295.39 nT", () => {
    expectDigits(out("nv-nmr-brms", { d: 10, rho: 67 }).B_rms, "295.39"); // 6.7e28 m⁻³ = 67 nm⁻³
  });

  it("ρ = 5e28 m⁻³, d = 3 nm → 1553.0 nT", () => {
    expectDigits(out("nv-nmr-brms", { d: 3, rho: 50 }).B_rms, "1553.0");
  });

  it("inverse: ρ = 6.7e28 m⁻³, B_rms = 300 nT → d = 9.897 nm", () => {
    expectDigits(out("nv-nmr-depth", { B_rms: 300, rho: 67 }).d, "9.897");
  });
});

describe("5. Hahn-echo AC sensitivity (Taylor et al., Nat. Phys. 4, 810 (2008))", () => {
  it("T2 = 100 µs, C = 0.03 → η = 29.728 nT/√Hz, δB(1 s) = 29.728 nT", () => {
    const r = out("hahn-echo-sensitivity", { T2: 100, C: 0.03, T_total: 1 });
    expectDigits(r.eta, "29.728"); // Taylor et al. 2008 formula, g = 2.0028
    expectDigits(r.dB_min, "29.728");
  });

  it("T2 = 1 ms, C = 0.05 → η = 5.6405 nT/√Hz, δB(10 s) = 1.7837 nT", () => {
    const r = out("hahn-echo-sensitivity", { T2: 1000, C: 0.05, T_total: 10 });
    expectDigits(r.eta, "5.6405"); // Taylor et al. 2008 formula
    expectDigits(r.dB_min, "1.7837"); // δB = η/√T_total
  });

  it("states the assumptions REFERENCES.md asks the UI to show", () => {
    const calc = listCalculators().find((c) => c.id === "hahn-echo-sensitivity");
    const text = calc?.assumptions.join(" ") ?? "";
    for (const phrase of ["Single NV", "τ ≈ T2", "best phase", "white noise", "no dead time"]) expect(text).toContain(phrase);
  });
});
