// Worked examples: each published formula (paper and equation named per block) evaluated by hand with
// CODATA 2018 constants (Tiesinga et al., Rev. Mod. Phys. 93, 025010 (2021), doi:10.1103/RevModPhys.93.025010;
// the constant's CODATA name beside each use) and the NV g-factor 2.0028 (Loubser & van Wyk, Rep. Prog.
// Phys. 41, 1201 (1978), doi:10.1088/0034-4885/41/8/002; value from memory). The hand calculation is
// written beside each expected value, which is checked through the calculators to the digits given.
// γ_NV = gμB/h = 2.0028 × 9.2740100783e-24 J/T ("Bohr magneton") / 6.62607015e-34 J s ("Planck
// constant") = 28.0317 GHz/T = 28.0317 MHz/mT.
import { describe, expect, it } from "vitest";
import { listCalculators, runCalculator } from "@/lib/physics/calculators";
import { pointDipoleField } from "@/lib/physics/dipole";
import { odmrResonances } from "@/lib/physics/odmr";
import { expectDigits } from "./expect-digits";

const out = (id: string, inputs: Record<string, number>) => runCalculator(id, inputs).outputs;

// |B| = (μ0/4π) μp √(1 + 3cos²θ) / d³ (Jackson, Classical Electrodynamics, 3rd ed., Wiley 1999, eq. 5.56;
// equation number from memory). μ0/4π = 1.00000000054e-7 N/A² ("vacuum mag. permeability"
// 1.25663706212e-6, CODATA 2018); μp = 1.41060679736e-26 J/T ("proton mag. mom.", CODATA 2018) = ħγp/2.
describe("1. point-dipole field of one proton (Jackson, Classical Electrodynamics, eq. 5.56)", () => {
  it("d = 3 nm: 52.24 nT equatorial, 104.5 nT on axis", () => {
    expectDigits(out("proton-dipole-field", { d: 3, theta: 90 }).B, "52.24"); // 1e-7 × 1.41061e-26 / (3e-9)³ = 52.245 nT
    expectDigits(out("proton-dipole-field", { d: 3, theta: 0 }).B, "104.5"); // × √(1 + 3) = 2: 104.49 nT
  });

  it("d = 10 nm: 1.411 nT equatorial, 2.821 nT on axis", () => {
    expectDigits(out("proton-dipole-field", { d: 10, theta: 90 }).B, "1.411"); // 1e-7 × 1.41061e-26 / 1e-24 = 1.4106 nT
    expectDigits(out("proton-dipole-field", { d: 10, theta: 0 }).B, "2.821"); // × 2 = 2.8212 nT
  });

  it("SI pure function agrees (52.24 nT at 3 nm, equator)", () => {
    expectDigits(pointDipoleField(3e-9, Math.PI / 2).magnitude * 1e9, "52.24"); // as above, 52.245 nT
  });
});

// f± = D ± γ_NV·B for a field along the NV axis (spin-1 ground state, Doherty et al., Phys. Rep. 528, 1
// (2013), doi:10.1016/j.physrep.2013.02.001, from memory); D = 2870 MHz at room temperature (Acosta et al.,
// Phys. Rev. Lett. 104, 070801 (2010), doi:10.1103/PhysRevLett.104.070801, from memory).
describe("2. ODMR with the field along the NV axis (Acosta et al. 2010; Loubser & van Wyk 1978, from memory)", () => {
  it("B = 5 mT → f₋ = 2729.84 MHz, f₊ = 3010.16 MHz", () => {
    const r = out("odmr-resonances", { B: 5, D: 2870 });
    expectDigits(r.f_minus, "2729.84"); // 2870 − 28.0317 × 5 = 2729.842 MHz
    expectDigits(r.f_plus, "3010.16"); // 2870 + 28.0317 × 5 = 3010.158 MHz
    expectDigits(odmrResonances(5e-3).fMinus / 1e6, "2729.84"); // same, SI function with default D
  });

  it("f₋ = 2750, f₊ = 2990 MHz → B = 4.2809 mT, D = 2870 MHz", () => {
    const r = out("odmr-field-from-pair", { f_minus: 2750, f_plus: 2990 });
    expectDigits(r.B, "4.2809"); // B = (f₊ − f₋)/(2γ_NV) = 240 / (2 × 28.0317) = 4.28087 mT
    expectDigits(r.D, "2870"); // D = (f₊ + f₋)/2 = 5740 / 2 = 2870 MHz
  });

  it("single line B = (D − f₋)/γ is valid only below D/γ = 102.38 mT", () => {
    const { outputs, warnings } = runCalculator("odmr-field-from-single-line", { f_minus: 2750, D: 2870 });
    expectDigits(outputs.B, "4.2809"); // (2870 − 2750) / 28.0317 = 4.28087 mT
    expectDigits(outputs.B_limit, "102.38"); // D/γ_NV = 2870 / 28.0317 = 102.384 mT (f₋ reaches 0)
    expect(warnings.join(" ")).toContain("102.38 mT");
  });
});

// f = (γ/2π)·B. ¹H: "proton gyromag. ratio in MHz/T" 42.577478518 (CODATA 2018). ¹³C, ¹⁹F: γ/2π from
// the magnetogyric ratios of Harris et al., Pure Appl. Chem. 73, 1795 (2001), doi:10.1351/pac200173111795,
// Table 1 (IUPAC 2001): ¹³C 6.728284e7 rad s⁻¹ T⁻¹ → 10.7084 MHz/T, ¹⁹F 25.18148e7 → 40.0776 MHz/T (from memory).
describe("3. Larmor frequency ↔ field (CODATA 2018 ¹H; IUPAC 2001 ¹³C, ¹⁹F)", () => {
  it("¹H at 0.1 T: 4.2577 MHz; 2.5 MHz ↔ 58.716 mT", () => {
    expectDigits(out("larmor-frequency", { B: 100 }).f_1H, "4.2577"); // 42.577478518 × 0.1 = 4.25775 MHz
    expectDigits(out("larmor-field", { f: 2.5 }).B_1H, "58.716"); // 2.5 / 42.577478518 T = 58.7165 mT
  });

  it("¹³C at 0.3 T: 3.2125 MHz; ¹⁹F at 0.3 T: 12.023 MHz", () => {
    const r = out("larmor-frequency", { B: 300 });
    expectDigits(r.f_13C, "3.2125"); // 10.7084 × 0.3 = 3.21252 MHz (Harris et al. 2001)
    expectDigits(r.f_19F, "12.023"); // 40.0776 × 0.3 = 12.0233 MHz (Harris et al. 2001)
  });

  it("dynamical-decoupling dip at τ = 1/(2f)", () => {
    // τ = 1/(2f) (dip of a CPMG/XY-type sequence at the Larmor frequency; common practice):
    // 1 / (2 × 4.2577478518 MHz) = 117.433 ns
    expectDigits(out("decoupling-dip", { f: 4.2577478518 }).tau, "117.433");
    expect(out("decoupling-dip", { f: 2.5 }).tau).toBeCloseTo(200, 10); // 1/(2 · 2.5 MHz) = 200 ns exactly
  });
});

// B_rms² = ρ (μ0 ħ γp / 4π)² · 5π / (96 d³) (Pham et al., Phys. Rev. B 93, 045425 (2016),
// doi:10.1103/PhysRevB.93.045425; Staudacher et al., Science 339, 561 (2013), doi:10.1126/science.1231675;
// printed form and DOIs from memory; 5π/96 for a (100) surface and transverse components).
// μ0ħγp/4π = 1e-7 × 1.054571817e-34 ("reduced Planck constant") × 2.6752218744e8 ("proton gyromag.
// ratio") = 2.82121e-33 T m³ (CODATA 2018); 5π/96 = 0.163625. Evaluated in double precision by hand.
describe("4. NV-NMR B_rms of a proton layer (Pham et al., PRB 93, 045425 (2016); Staudacher et al., Science 339, 561 (2013); printed form from memory)", () => {
  it("ρ = 6.7e28 m⁻³, d = 10 nm → 295.39 nT", () => {
    // √(6.7e28 × (2.82121e-33)² × 0.163625 / 1e-24) = 295.391 nT; 6.7e28 m⁻³ = 67 nm⁻³
    expectDigits(out("nv-nmr-brms", { d: 10, rho: 67 }).B_rms, "295.39");
  });

  it("ρ = 5e28 m⁻³, d = 3 nm → 1553.0 nT", () => {
    // √(5e28 × (2.82121e-33)² × 0.163625 / 2.7e-26) = 1552.97 nT
    expectDigits(out("nv-nmr-brms", { d: 3, rho: 50 }).B_rms, "1553.0");
  });

  it("inverse: ρ = 6.7e28 m⁻³, B_rms = 300 nT → d = 9.897 nm", () => {
    // d = (6.7e28 × (2.82121e-33)² × 0.163625 / (300e-9)²)^(1/3) = 9.8973 nm
    expectDigits(out("nv-nmr-depth", { B_rms: 300, rho: 67 }).d, "9.897");
  });
});

// η = (π/2) · ħ/(g μB) · 1/(C √T2), δB = η/√T_total (Taylor et al., Nat. Phys. 4, 810 (2008),
// doi:10.1038/nphys1075, Hahn-echo AC sensitivity; DOI from memory). With g = 2.0028 and CODATA 2018
// "reduced Planck constant" and "Bohr magneton": (π/2) ħ/(g μB) = 8.91848e-12 T s.
describe("5. Hahn-echo AC sensitivity (Taylor et al., Nat. Phys. 4, 810 (2008))", () => {
  it("T2 = 100 µs, C = 0.03 → η = 29.728 nT/√Hz, δB(1 s) = 29.728 nT", () => {
    const r = out("hahn-echo-sensitivity", { T2: 100, C: 0.03, T_total: 1 });
    expectDigits(r.eta, "29.728"); // 8.91848e-12 / (0.03 × √1e-4) = 2.97283e-8 T/√Hz
    expectDigits(r.dB_min, "29.728"); // η/√(1 s)
  });

  it("T2 = 1 ms, C = 0.05 → η = 5.6405 nT/√Hz, δB(10 s) = 1.7837 nT", () => {
    const r = out("hahn-echo-sensitivity", { T2: 1000, C: 0.05, T_total: 10 });
    expectDigits(r.eta, "5.6405"); // 8.91848e-12 / (0.05 × √1e-3) = 5.64054e-9 T/√Hz
    expectDigits(r.dB_min, "1.7837"); // 5.64054 / √10 = 1.78370 nT
  });

  it("states the assumptions behind Taylor et al.'s estimate (single NV, τ ≈ T2, best phase, white noise, no dead time)", () => {
    const calc = listCalculators().find((c) => c.id === "hahn-echo-sensitivity");
    const text = calc?.assumptions.join(" ") ?? "";
    for (const phrase of ["Single NV", "τ ≈ T2", "best phase", "white noise", "no dead time"]) expect(text).toContain(phrase);
  });
});

// η ≈ P_F · h/(g μB) · Δν/(C √R), P_F = 4/(3√3) (Dréau et al., Phys. Rev. B 84, 195204 (2011),
// shot-noise-limited CW-ODMR). Expected values computed independently in Python 3 with CODATA 2018
// h = 6.62607015e-34 J s, μB = 9.2740100783e-24 J/T and g = 2.0028:
// python3 -c "import math; print(4/(3*math.sqrt(3))*6.62607015e-34/(2.0028*9.2740100783e-24)*1e6/(0.01*math.sqrt(1e5))/1e-9)"
describe("CW-ODMR shot-noise sensitivity (Dréau et al., PRB 84, 195204 (2011))", () => {
  it("Δν = 1 MHz, C = 1 %, R = 100 kcps → η = 8684.2 nT/√Hz", () => {
    expectDigits(out("cw-odmr-sensitivity", { linewidth: 1, C: 0.01, R: 100 }).eta, "8684.2"); // 8684.1835
  });
  it("Δν = 0.3 MHz, C = 20 %, R = 200 kcps → η = 92.110 nT/√Hz", () => {
    expectDigits(out("cw-odmr-sensitivity", { linewidth: 0.3, C: 0.2, R: 200 }).eta, "92.110"); // 92.109676
  });
  it("Δν = 10 MHz, C = 3 %, R = 1 Mcps → η = 9153.9 nT/√Hz", () => {
    expectDigits(out("cw-odmr-sensitivity", { linewidth: 10, C: 0.03, R: 1000 }).eta, "9153.9"); // 9153.9332
  });
});
