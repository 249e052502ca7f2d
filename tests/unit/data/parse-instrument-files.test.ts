import { describe, expect, it } from "vitest";
import { col, parse } from "./helpers";

describe("files as instruments write them", () => {
  it("a commented header block whose last comment line names the columns", () => {
    const file = [
      "# Saved Data from ODMR scan on 12.03.2024",
      "# Timestamp: 2024-03-12 10:12:01",
      "# Microwave power (dBm): -20.0",
      "#",
      "# frequency (Hz)\tcount data (counts/s)",
      "2.8500000000000000e+09\t1.2345e+05",
      "2.8510000000000000e+09\t1.2298e+05",
    ].join("\n");
    const t = parse(file, "odmr.dat");
    expect(t.columns.map((c) => [c.name, c.unit])).toEqual([
      ["frequency", "Hz"],
      ["count data", "cps"],
    ]);
    expect(col(t, "frequency")).toEqual([2.85e9, 2.851e9]);
    expect(t.metadata).toMatchObject({ Timestamp: "2024-03-12 10:12:01", "Microwave power (dBm)": "-20.0" });
    expect(t.headerLines).toHaveLength(5);
  });

  it("a units row under the names", () => {
    const t = parse("time,counts,label\nus,[kcps],\n1,2,a\n3,4,b\n");
    expect(t.columns.map((c) => [c.name, c.unit, c.sourceHeader])).toEqual([
      ["time", "µs", "time (us)"],
      ["counts", "kcps", "counts (kcps)"],
      ["label", null, "label"],
    ]);
    expect(t.rowCount).toBe(2);
  });

  it("an INI-like block with [Sections] and key=value lines", () => {
    const t = parse("[Header]\nInstrument=Spectrometer\nExposure=1.5\n[Data]\nWavelength (nm)\tIntensity\n500.1\t12\n500.2\t15\n", "spec.txt");
    expect(t.metadata).toEqual({ Instrument: "Spectrometer", Exposure: "1.5" });
    expect(col(t, "Wavelength")).toEqual([500.1, 500.2]);
  });

  it("a German spreadsheet export (; and decimal comma)", () => {
    const t = parse("Zeit [µs];Signal (mV)\n0,1;1,5\n0,2;1,25\n", "export.csv");
    expect([t.delimiter, t.decimal]).toEqual([";", ","]);
    expect(col(t, "Signal")).toEqual([1.5, 1.25]);
  });

  it("fixed-width scientific notation without a header", () => {
    const t = parse("   1.0000E-06   2.345E+04\n   2.0000E-06   2.301E+04\n", "echo.asc");
    expect(col(t, "col1")).toEqual([1e-6, 2e-6]);
    expect(col(t, "col2")).toEqual([23450, 23010]);
  });

  it("a TSV row of empty cells is a row of missing values, not a blank line", () => {
    const t = parse("x\ty\n\t\n1\t2\n3\t\n", "t.tsv");
    expect(t.rowCount).toBe(3);
    expect(col(t, "x").map(String)).toEqual(["NaN", "1", "3"]);
  });

  it("a DOS end-of-file marker (Ctrl-Z) after the last line", () => {
    expect(parse("a,b\r\n1,2\r\n\u001a").rowCount).toBe(1);
  });

  it("padded CSV cells and a forced format", () => {
    expect(col(parse("w,i\n 500.1 , 12 \n500.2,15\n"), "i")).toEqual([12, 15]);
    const t = parse("a\tb\n1\t2\n", "x.dat", { format: "tsv" });
    expect([t.format, t.delimiter]).toEqual(["tsv", "\t"]);
  });
});

describe("a million rows", () => {
  it("parses 1,000,000 × 3 numeric CSV exactly (timings live in bench/ingest-parse.ts)", () => {
    const rows = 1_000_000;
    const parts: string[] = ["t_us,a,b"];
    for (let i = 0; i < rows; i++) parts.push(`${(i * 0.001).toFixed(3)},${(i % 977) * 1.25},${-(i % 13) / 8}`);
    const t = parse(`${parts.join("\n")}\n`);
    expect(t.rowCount).toBe(rows);
    expect(t.columns[0]).toMatchObject({ name: "t", unit: "µs" });
    for (const i of [0, 1, 123_456, 999_999]) {
      const cells = parts[i + 1].split(",").map(Number);
      expect(t.data.map((d) => (d as Float64Array)[i])).toEqual(cells);
    }
  });
});
