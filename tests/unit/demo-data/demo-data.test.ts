/**
 * The invented demo measurement files (lib/demo-data): determinism, inventory, true parameters
 * in the notes, recovery of those parameters by the project's own fitter, and parsing.
 * Model forms (from memory): Hahn echo S0 + A·exp[−(t/T2)ⁿ], relaxation S0 + A·exp(−t/T1), Ramsey
 * S0 + A·exp[−(t/T2*)²]·cos(2πδt + φ) (three cosines at δ + m_I|A∥| for ¹⁴N); ODMR f± = D ± γ_NV·B;
 * Larmor f = (γ/2π)·B. Constants: CODATA 2018 (Rev. Mod. Phys. 93, 025010 (2021)), γ_NV = gμB/h with
 * g = 2.0028 (Loubser & van Wyk, Rep. Prog. Phys. 41, 1201 (1978), from memory).
 */
import { describe, expect, it } from "vitest";
import { demoFiles, type DemoFile } from "@/lib/demo-data";
import { echoSignal } from "@/lib/demo-data/hahn-echo";
import { mulberry32, Rng } from "@/lib/demo-data/prng";
import { fitModel } from "@/lib/analysis";
import { parseTable, type ParsedTable } from "@/lib/data/parse";

const files = demoFiles();
const byKind = (kind: DemoFile["kind"]) => files.filter((f) => f.kind === kind);
const GROUPS = ["as-grown", "annealed-1200C", "oxygen-terminated"];

/** Numeric value following `label =` in a notes string. */
function noted(notes: string, label: string): number {
  const escaped = label.replace(/[.*+?^${}()|[\]\\]/g, "\\$&");
  const m = new RegExp(`${escaped} = (-?[\\d.]+)`).exec(notes);
  if (!m) throw new Error(`notes lack "${label} = …": ${notes}`);
  return Number(m[1]);
}

function parse(f: DemoFile): ParsedTable {
  return parseTable(new TextEncoder().encode(f.content), { fileName: f.fileName });
}

function column(t: ParsedTable, name: string): Float64Array {
  const j = t.columns.findIndex((c) => c.name === name);
  if (j < 0) throw new Error(`no column ${name}`);
  return t.data[j] as Float64Array;
}

describe("seeded noise (prng.ts)", () => {
  it("mulberry32 repeats for the same seed and differs between seeds", () => {
    const a = mulberry32(42);
    const b = mulberry32(42);
    const c = mulberry32(43);
    const seqA = Array.from({ length: 5 }, a);
    expect(Array.from({ length: 5 }, b)).toEqual(seqA);
    expect(Array.from({ length: 5 }, c)).not.toEqual(seqA);
    for (const v of seqA) expect(v >= 0 && v < 1).toBe(true);
  });

  it("Gaussian and Poisson draws have the right mean and variance", () => {
    const rng = new Rng(7);
    const n = 40_000;
    const moments = (draw: () => number) => {
      let s = 0;
      let s2 = 0;
      for (let i = 0; i < n; i++) {
        const v = draw();
        s += v;
        s2 += v * v;
      }
      return { mean: s / n, variance: s2 / n - (s / n) ** 2 };
    };
    const g = moments(() => rng.normal(3, 2));
    expect(g.mean).toBeCloseTo(3, 1);
    expect(g.variance).toBeGreaterThan(3.8);
    expect(g.variance).toBeLessThan(4.2);
    for (const mu of [4, 500]) {
      // Knuth below the threshold, normal approximation above; Poisson variance = mean.
      const p = moments(() => rng.poisson(mu));
      expect(Math.abs(p.mean - mu)).toBeLessThan(5 * Math.sqrt(mu / n));
      expect(p.variance / mu).toBeGreaterThan(0.95);
      expect(p.variance / mu).toBeLessThan(1.05);
    }
  });
});

describe("demo files: inventory", () => {
  it("is deterministic: two calls give identical bytes", () => {
    expect(JSON.stringify(demoFiles())).toBe(JSON.stringify(files));
  });

  it("has the agreed number of files per kind", () => {
    const counts: Record<string, number> = {};
    for (const f of files) counts[f.kind] = (counts[f.kind] ?? 0) + 1;
    expect(counts).toEqual({ pl_map: 1, pl_spectrum: 1, odmr: 3, hahn_echo: 12, decoupling: 5, relaxation: 6, ramsey: 1, nv_nmr: 1, other: 1 });
    for (const g of GROUPS) {
      expect(byKind("hahn_echo").filter((f) => f.tags.group === g)).toHaveLength(4);
      expect(byKind("relaxation").filter((f) => f.tags.group === g)).toHaveLength(2);
    }
  });

  it("every file is non-empty, uniquely named and belongs to the scenario", () => {
    expect(new Set(files.map((f) => f.fileName)).size).toBe(files.length);
    for (const f of files) {
      expect(f.content.length).toBeGreaterThan(500);
      expect(f.content.endsWith("\n")).toBe(true);
      expect(f.fileName).toMatch(/^[\w.-]+\.(csv|json)$/);
      expect(f.name.length).toBeGreaterThan(0);
      expect(f.sample).toBe("K17");
      expect(["confocal setup A", "spectrometer S2"]).toContain(f.instrument);
      expect(f.measuredAt).toMatch(/^2026-\d\d-\d\dT\d\d:\d\d:00Z$/);
      expect(Number.isNaN(Date.parse(f.measuredAt))).toBe(false);
      expect(GROUPS).toContain(f.tags.group);
      expect(f.notes).toMatch(/Generated/);
    }
    expect(byKind("pl_spectrum")[0].instrument).toBe("spectrometer S2");
  });
});

describe("demo files: true parameters in the notes", () => {
  it("echo notes give T2 and n, drawn per group (stretched-exponential echo, n between 1.5 and 2.5)", () => {
    for (const f of byKind("hahn_echo")) {
      const n = noted(f.notes, "n");
      expect(n).toBeGreaterThanOrEqual(1.5);
      expect(n).toBeLessThanOrEqual(2.5);
      expect(noted(f.notes, "true T2")).toBeGreaterThan(0);
    }
    const mean = (g: string) => {
      const t2 = byKind("hahn_echo")
        .filter((f) => f.tags.group === g)
        .map((f) => noted(f.notes, "true T2"));
      return t2.reduce((a, b) => a + b, 0) / t2.length;
    };
    // Nominal 60 ± 15, 150 ± 30, 220 ± 40 µs; four centres per group.
    expect(Math.abs(mean("as-grown") - 60)).toBeLessThan(15);
    expect(Math.abs(mean("annealed-1200C") - 150)).toBeLessThan(30);
    expect(Math.abs(mean("oxygen-terminated") - 220)).toBeLessThan(40);
  });

  it("T1, Ramsey, ODMR and NV-NMR notes carry their parameters", () => {
    for (const f of byKind("relaxation")) {
      const t1 = noted(f.notes, "true T1");
      expect(t1).toBeGreaterThanOrEqual(3);
      expect(t1).toBeLessThanOrEqual(6);
    }
    const ramsey = byKind("ramsey")[0].notes;
    expect(noted(ramsey, "true T2*")).toBe(1520);
    expect(noted(ramsey, "δ")).toBe(2.5);
    expect(ramsey).toContain("0.0025 ns⁻¹");
    // γ_NV = 2.0028 × 9.2740100783e-24 J/T ("Bohr magneton") / 6.62607015e-34 J s ("Planck constant"),
    // CODATA 2018 = 28.0317 GHz/T; 4.2 mT → ±28.0317 × 4.2 = ±117.733 MHz about D = 2870 MHz.
    const low = byKind("odmr").find((f) => f.tags.field === "4.2 mT")!;
    expect(noted(low.notes, "f₋")).toBeCloseTo(2870 - 28.0317 * 4.2, 2);
    expect(noted(low.notes, "f₊")).toBeCloseTo(2870 + 28.0317 * 4.2, 2);
    // CODATA 2018 "proton gyromag. ratio in MHz/T" 42.577478518; 0.2093 T → 8.9115 MHz.
    const nmr = byKind("nv_nmr")[0].notes;
    expect(nmr).toContain("B = 0.2093 T");
    expect(nmr).toContain(`${(42.577478518 * 0.2093).toFixed(4)} MHz`);
    expect((42.577478518 * 0.2093).toFixed(4)).toBe("8.9115");
  });
});

describe("demo files: the fitter recovers the true parameters", () => {
  it("Hahn echo: residuals against the stated formula are consistent with the stated σ", () => {
    for (const f of byKind("hahn_echo")) {
      const t = parse(f);
      const [tau, y, sigma] = [column(t, "tau"), column(t, "signal"), column(t, "sigma")];
      const truth = { S0: noted(f.notes, "S0"), A: noted(f.notes, "A"), T2: noted(f.notes, "true T2"), n: noted(f.notes, "n"), sigma: 0 };
      let chi2 = 0;
      for (let i = 0; i < tau.length; i++) chi2 += ((y[i] - echoSignal(tau[i], truth)) / sigma[i]) ** 2;
      // χ² with 80 degrees of freedom: mean 80, sd √160 ≈ 12.6.
      expect(chi2 / tau.length).toBeGreaterThan(0.55);
      expect(chi2 / tau.length).toBeLessThan(1.5);
    }
  });

  it("Hahn echo: fitModel('hahn_echo') recovers T2 and n within 3σ", () => {
    for (const f of byKind("hahn_echo")) {
      const t = parse(f);
      const fit = fitModel("hahn_echo", { x: column(t, "tau"), y: column(t, "signal"), sigma: column(t, "sigma") });
      const p = Object.fromEntries(fit.params.map((q) => [q.name, q]));
      for (const [name, label] of [
        ["T2", "true T2"],
        ["n", "n"],
      ] as const) {
        const truth = noted(f.notes, label);
        expect(Number.isFinite(p[name].stderr), `${f.fileName} ${name} stderr`).toBe(true);
        expect(Math.abs(p[name].value - truth), `${f.fileName} ${name}`).toBeLessThan(3 * p[name].stderr);
      }
    }
  });

  it("relaxation: fitModel('relaxation') recovers T1 within 3σ", () => {
    for (const f of byKind("relaxation")) {
      const t = parse(f);
      const fit = fitModel("relaxation", { x: column(t, "wait"), y: column(t, "pl") });
      const t1 = fit.params.find((q) => q.name === "T1")!;
      expect(Math.abs(t1.value - noted(f.notes, "true T1")), f.fileName).toBeLessThan(3 * t1.stderr);
    }
  });

  it("Ramsey: fitModel('ramsey_14n') recovers T2*, δ and |A∥| in ns units", () => {
    const f = byKind("ramsey")[0];
    const t = parse(f);
    const fit = fitModel("ramsey_14n", { x: column(t, "t"), y: column(t, "pl") });
    const p = Object.fromEntries(fit.params.map((q) => [q.name, q]));
    expect(Math.abs(p.T2star.value - 1520)).toBeLessThan(3 * p.T2star.stderr);
    expect(Math.abs(p.delta.value - 0.0025)).toBeLessThan(3 * p.delta.stderr);
    expect(Math.abs(p.Apar.value - 0.00216)).toBeLessThan(3 * p.Apar.stderr);
  });
});

describe("demo files: lib/data/parse reads every file", () => {
  it.each(files.map((f) => [f.fileName, f] as const))("%s parses without error", (_name, f) => {
    const t = parse(f);
    expect(t.rowCount).toBeGreaterThan(0);
    expect(t.metadata).toBeDefined();
  });

  it("shapes and locale are recognised", () => {
    const map = parse(byKind("pl_map")[0]);
    expect(map.format).toBe("matrix");
    expect(map.rowCount).toBe(60 * 60);
    const counts = column(map, "value");
    // ≈ 5 kcounts/s background at 10 ms dwell is ≈ 50 counts; the lowest of 3600 Poisson draws is ≈ 20 counts.
    expect(Math.min(...counts)).toBeGreaterThan(1_000);
    expect(Math.max(...counts)).toBeGreaterThan(50_000);
    expect(Math.max(...column(map, "x"))).toBeLessThan(20);

    const spectrum = parse(byKind("pl_spectrum")[0]);
    expect(spectrum.columns.map((c) => c.unit)).toEqual(["nm", null]);
    expect(spectrum.rowCount).toBe(1251);

    const european = parse(byKind("odmr").find((f) => f.content.includes("f [MHz];PL [norm]"))!);
    expect(european.delimiter).toBe(";");
    expect(european.decimal).toBe(",");
    const fr = column(european, "f");
    expect(fr[0]).toBe(2650);

    const low = parse(byKind("odmr").find((f) => f.tags.field === "4.2 mT")!);
    expect(low.rowCount).toBe(2000);
    expect(low.columns.map((c) => c.sourceHeader)).toEqual(["frequency (MHz)", "pl (a.u.)"]);

    const echo = parse(byKind("hahn_echo")[0]);
    expect(echo.rowCount).toBe(80);
    expect(echo.columns[0]).toMatchObject({ name: "tau", unit: "µs" });
    expect(echo.metadata.sample).toBe("K17");

    const ramsey = parse(byKind("ramsey")[0]);
    expect(ramsey.rowCount).toBe(400);
    expect(ramsey.columns[0].unit).toBe("ns");

    const calibration = parse(byKind("other")[0]);
    expect(calibration.format).toBe("json");
    expect(calibration.rowCount).toBe(12);
  });
});

describe("demo files: the CPMG decoupling series", () => {
  it("one file per N = 1, 2, 4, 8, 16 with N in the pulses tag and the true T2 = 95 µs · N^(2/3) in the notes", () => {
    const series = demoFiles().filter((f) => f.kind === "decoupling");
    expect(series.map((f) => f.tags.pulses)).toEqual(["1", "2", "4", "8", "16"]);
    // In Python: 95 * 2**(2/3) = 150.803, 95 * 16**(2/3) = 603.212 µs.
    const t2 = series.map((f) => Number(/true T2 = ([\d.]+)/.exec(f.notes)![1]));
    expect(t2[0]).toBe(95);
    expect(t2[1]).toBeCloseTo(150.8, 1);
    expect(t2[4]).toBeCloseTo(603.21, 1);
  });
});
