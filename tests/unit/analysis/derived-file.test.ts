/**
 * The stored derived CSV of an analysis says how its errors were obtained: whether σ weights were
 * used (and from which column), that ± is one standard error scaled by √χ²ᵣ, which parameters were
 * held fixed and which the data did not determine. The header block survives the product's own
 * parser as metadata, so the file describes itself wherever it goes.
 */
import { describe, expect, it } from "vitest";
import { derivedCsv, type DerivedFileInput } from "@/lib/server/analyses/derived-file";
import { parseTable } from "@/lib/data/parse";

const base: DerivedFileInput = {
  sourceVersionId: "ver_1",
  sourceSha256: "ab12",
  modelId: "hahn_echo",
  modelVersion: "1.0.0",
  xName: "t",
  xUnit: "µs",
  yName: "PL",
  yUnit: "counts",
  sigmaColumn: null,
  parameters: [
    { name: "S0", value: 0.5, stderr: 0.01, unit: "counts" },
    { name: "A", value: 0.3, stderr: 0.02, unit: "counts" },
    { name: "T2", value: 38.7, stderr: NaN, unit: "µs" },
    { name: "n", value: 2, stderr: 0, unit: "", fixed: true },
  ],
  derived: [{ name: "T2_ms", value: 0.0387, stderr: 0.0007, unit: "ms", formula: "T₂/1000" }],
  chi2red: 1.25,
  dof: 196,
  curve: { x: [0, 1], y: [0.8, 0.79] },
  dataX: [0, 1],
  dataY: [0.81, 0.78],
  residuals: [0.01, -0.01],
};

const header = (csv: string) => csv.split("\n").filter((l) => l.startsWith("#"));

describe("derived CSV header", () => {
  it("says an unweighted fit was unweighted and that ± is scaled by √χ²ᵣ", () => {
    const lines = header(derivedCsv(base));
    expect(lines).toContain("# weights: none (unweighted least squares: every point counts equally, σ = 1)");
    expect(lines.find((l) => l.startsWith("# errors:"))).toMatch(/one standard error .* scaled by √χ²ᵣ/);
    expect(lines).toContain("# reduced chi-square: 1.25 (196 degrees of freedom)");
  });

  it("names the σ column of a weighted fit", () => {
    const lines = header(derivedCsv({ ...base, sigmaColumn: "PL_err" }));
    expect(lines).toContain('# weights: 1/σ² per point, σ from the column "PL_err" (y units)');
  });

  it("writes fitted, fixed and undetermined parameters differently, never as ± 0 or ± NaN", () => {
    const lines = header(derivedCsv(base));
    expect(lines).toContain("# parameter S0: 0.5 ± 0.01 counts");
    expect(lines).toContain("# parameter T2: 38.7 µs (not determined by the data: no standard error)");
    expect(lines).toContain("# parameter n: 2 (held fixed, not fitted)");
    expect(lines).toContain("# derived T2_ms: 0.0387 ± 0.0007 ms [T₂/1000]");
    expect(lines.some((l) => /± 0( |$)|± NaN|± $/.test(l))).toBe(false);
  });

  it("is read back by the upload parser with the header as metadata and the three series as rows", () => {
    const table = parseTable(new TextEncoder().encode(derivedCsv({ ...base, sigmaColumn: "PL_err" })), { fileName: "fit.csv" });
    expect(table.metadata.weights).toBe('1/σ² per point, σ from the column "PL_err" (y units)');
    expect(table.metadata.errors).toMatch(/^± is one standard error/);
    expect(table.metadata["parameter T2"]).toBe("38.7 µs (not determined by the data: no standard error)");
    expect(table.columns.map((c) => c.name)).toEqual(["series", "t", "PL"]);
    expect(table.rowCount).toBe(6);
  });
});
