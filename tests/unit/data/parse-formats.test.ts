import { describe, expect, it } from "vitest";
import { col, parse } from "./helpers";

describe("CSV", () => {
  it("reads a header with units and numeric columns", () => {
    const t = parse("time (µs),counts\n0.5,120\n1.0,98\n1.5,77\n");
    expect(t.format).toBe("csv");
    expect(t.delimiter).toBe(",");
    expect(t.decimal).toBe(".");
    expect(t.rowCount).toBe(3);
    expect(t.columns).toEqual([
      { name: "time", unit: "µs", type: "number", sourceHeader: "time (µs)" },
      { name: "counts", unit: null, type: "number", sourceHeader: "counts" },
    ]);
    expect(t.data[0]).toBeInstanceOf(Float64Array);
    expect(col(t, "time")).toEqual([0.5, 1, 1.5]);
    expect(col(t, "counts")).toEqual([120, 98, 77]);
    expect(t.warnings).toEqual([]);
  });

  it("handles CRLF, lone CR, no final newline, quotes and string columns", () => {
    const t = parse('label,"B (mT)",note\r\nA,1.5,"a, b"\r\nB,"2.5","say ""hi"""\rC,3e-1,\r\n"D",-4,"two\nlines"');
    expect(t.rowCount).toBe(4);
    expect(t.columns.map((c) => [c.name, c.type])).toEqual([
      ["label", "string"],
      ["B", "number"],
      ["note", "string"],
    ]);
    expect(col(t, "label")).toEqual(["A", "B", "C", "D"]);
    expect(col(t, "B")).toEqual([1.5, 2.5, 0.3, -4]);
    expect(col(t, "note")).toEqual(["a, b", 'say "hi"', "", "two\nlines"]);
  });

  it("reads empty and NaN-like cells as missing, counts them, and keeps inf", () => {
    const t = parse("x,y\n1,\n2,NaN\n3,N/A\n4,inf\n5,-Infinity\n6,7\n");
    const y = col(t, "y");
    expect(y.slice(0, 3).every((v) => Number.isNaN(v))).toBe(true);
    expect(y.slice(3)).toEqual([Infinity, -Infinity, 7]);
    expect(t.warnings).toContain('3 missing cells in column "y" read as NaN');
  });

  it("skips blank lines with a warning count and keeps comments in the data out", () => {
    const t = parse("x,y\n\n1,2\n\n   \n3,4\n# pause\n5,6\n\n");
    expect(col(t, "x")).toEqual([1, 3, 5]);
    expect(t.warnings).toContain("4 blank lines skipped");
    expect(t.warnings).toContain("1 comment line inside the data skipped");
  });

  it("parses numbers exactly like Number(), including long mantissas and Fortran exponents", () => {
    const cells = ["0.1", "1e-300", "123456789012345678901", "-0", "0.30000000000000004", "1.7976931348623157e308", "5e-324", "1.0D+03", "+.5", "7."];
    const t = parse(`v\n${cells.join("\n")}\n`);
    const expected = cells.map((c) => Number(c.replace("D", "e")));
    expect(col(t, "v")).toEqual(expected);
    expect(Object.is(col(t, "v")[3], -0)).toBe(true);
  });

  it("drops an empty trailing column made by a delimiter at the end of every line", () => {
    const t = parse("a,b,\n1,2,\n3,4,\n");
    expect(t.columns.map((c) => c.name)).toEqual(["a", "b"]);
    expect(col(t, "b")).toEqual([2, 4]);
  });

  it("takes title lines above the header into the header block", () => {
    const t = parse("ODMR sweep, NV 12\nf (GHz),PL (kcps)\n2.86,101\n2.87,88\n");
    expect(t.headerLines).toEqual(["ODMR sweep, NV 12"]);
    expect(t.columns.map((c) => `${c.name}|${c.unit}`)).toEqual(["f|GHz", "PL|kcps"]);
  });

  it("reads a file without a header as col1, col2 …", () => {
    const t = parse("1,2\n3,4\n");
    expect(t.columns.map((c) => c.name)).toEqual(["col1", "col2"]);
    expect(t.columns[0].sourceHeader).toBe("");
  });
});

describe("decimal comma and semicolons", () => {
  it("detects ; with a decimal comma", () => {
    const t = parse("f / MHz;PL\n2870,5;1,25\n2871,0;0,98\n");
    expect(t.delimiter).toBe(";");
    expect(t.decimal).toBe(",");
    expect(col(t, "f")).toEqual([2870.5, 2871]);
    expect(col(t, "PL")).toEqual([1.25, 0.98]);
    expect(t.warnings).toContain("decimal comma detected");
  });

  it("detects a decimal comma in tab- and whitespace-separated text", () => {
    expect(col(parse("a\tb\n1,5\t2,5\n", "x.tsv"), "b")).toEqual([2.5]);
    const t = parse("0,5 1,5\n1,5 2,5\n2,5 3,5\n", "x.txt");
    expect(t.delimiter).toBe("whitespace");
    expect(col(t, "col2")).toEqual([1.5, 2.5, 3.5]);
  });

  it("reads ; with a decimal point and integers with , as CSV", () => {
    expect(parse("a;b\n1.5;2.5\n").decimal).toBe(".");
    const t = parse("a,b\n1,2\n3,4\n");
    expect([t.delimiter, t.decimal]).toEqual([",", "."]);
  });

  it("accepts a decimal comma inside quotes of a comma-separated file", () => {
    const t = parse('a,b\n"1,5","2,25"\n"3,5","4"\n');
    expect(t.decimal).toBe(",");
    expect(col(t, "a")).toEqual([1.5, 3.5]);
    expect(col(t, "b")).toEqual([2.25, 4]);
  });

  it("obeys delimiter and decimal overrides", () => {
    const t = parse("a b\n1,5 2\n", "x.csv", { delimiter: "whitespace", decimal: "," });
    expect(col(t, "a")).toEqual([1.5]);
    expect(t.warnings).not.toContain("decimal comma detected");
    const u = parse("a;b\n1;2\n", "x.csv", { delimiter: ";" });
    expect(u.delimiter).toBe(";");
  });
});

describe("whitespace text with a header block", () => {
  const file = [
    "# Hahn echo, sample: D-17",
    "# sample: D-17",
    "% laser = 532 nm",
    "Temperature: 295 K",
    "",
    "tau (us)    signal [a.u.]   ref",
    "  0.1   0.98   1.00",
    "  0.2\t0.95\t1.01",
    "",
  ].join("\n");

  it("collects header lines and key: value metadata, and splits names with spaces", () => {
    const t = parse(file, "echo.txt");
    expect(t.format).toBe("text");
    expect(t.headerLines).toEqual(["# Hahn echo, sample: D-17", "# sample: D-17", "% laser = 532 nm", "Temperature: 295 K"]);
    expect(t.metadata).toMatchObject({ sample: "D-17", laser: "532 nm", Temperature: "295 K" });
    expect(t.columns.map((c) => [c.name, c.unit])).toEqual([
      ["tau", "µs"],
      ["signal", "a.u."],
      ["ref", null],
    ]);
    expect(col(t, "signal")).toEqual([0.98, 0.95]);
  });

  it("takes column names from the comment line right above header-less data", () => {
    const t = parse("# sample: D-17\n# t(ns) counts\n0 10\n5 9\n", "x.dat");
    expect(t.columns.map((c) => `${c.name}|${c.unit}`)).toEqual(["t|ns", "counts|null"]);
    expect(t.metadata).toEqual({ sample: "D-17" });
  });

  it("keeps metadata keys such as __proto__ as plain data", () => {
    const t = parse("# __proto__: x\n# constructor: y\na\n1\n");
    expect(Object.getPrototypeOf(t.metadata)).toBe(Object.prototype);
    expect(Object.keys(t.metadata)).toEqual(["__proto__", "constructor"]);
  });
});

describe("JSON", () => {
  it("reads an array of records", () => {
    const t = parse('[{"t (ns)": 0, "y": 1.5, "tag": "a"}, {"t (ns)": 10, "y": null, "tag": "b"}]', "r.json");
    expect(t.format).toBe("json");
    expect(t.delimiter).toBeNull();
    expect(t.columns.map((c) => [c.name, c.unit, c.type])).toEqual([
      ["t", "ns", "number"],
      ["y", null, "number"],
      ["tag", null, "string"],
    ]);
    expect(col(t, "t")).toEqual([0, 10]);
    expect(Number.isNaN(col(t, "y")[1])).toBe(true);
  });

  it("reads {columns, rows} with named units and top-level metadata", () => {
    const t = parse('{"sample": "D-17", "metadata": {"T": 4}, "columns": [{"name": "B", "unit": "mT"}, "counts"], "rows": [[1, 10], [2, 20]]}', "r.json");
    expect(t.columns.map((c) => [c.name, c.unit])).toEqual([
      ["B", "mT"],
      ["counts", null],
    ]);
    expect(col(t, "counts")).toEqual([10, 20]);
    expect(t.metadata).toEqual({ sample: "D-17", T: "4" });
  });

  it("reads column arrays and arrays of arrays, detected without the .json extension", () => {
    expect(col(parse('{"f": [1, 2, 3], "pl": [0.9, 0.8, 0.95]}', "x.txt"), "pl")).toEqual([0.9, 0.8, 0.95]);
    const t = parse('[["x", "y"], [1, 2], [3, 4]]', "x.dat");
    expect(col(t, "y")).toEqual([2, 4]);
  });
});

describe("2-D maps", () => {
  const rows = 4;
  const cols = 12;
  const pixel = (i: number, j: number) => 1000 + 37 * i + ((j * 7) % 5);

  it("turns a bare matrix into long format with index coordinates", () => {
    const lines = Array.from({ length: rows }, (_, i) => Array.from({ length: cols }, (_, j) => pixel(i, j)).join("\t"));
    const t = parse(lines.join("\n"), "map.txt");
    expect(t.format).toBe("matrix");
    expect(t.columns.map((c) => c.name)).toEqual(["x", "y", "value"]);
    expect(t.rowCount).toBe(rows * cols);
    const k = 2 * cols + 5; // row-major: y outer, x inner
    expect([col(t, "x")[k], col(t, "y")[k], col(t, "value")[k]]).toEqual([5, 2, pixel(2, 5)]);
  });

  it("uses an axis row and axis column (labelled or empty corner)", () => {
    const xs = Array.from({ length: cols }, (_, j) => (j * 0.1).toFixed(1));
    const ys = Array.from({ length: rows }, (_, i) => -1 + i * 0.5);
    for (const corner of ["y\\x", "", "0", "NaN"]) {
      const lines = [[corner, ...xs].join(","), ...ys.map((y, i) => [y, ...xs.map((_, j) => pixel(i, j))].join(","))];
      const t = parse(lines.join("\n"), "map.csv");
      expect(t.format).toBe("matrix");
      expect(t.rowCount).toBe(rows * cols);
      const k = 3 * cols + 4;
      expect([col(t, "x")[k], col(t, "y")[k], col(t, "value")[k]]).toEqual([0.4, 0.5, pixel(3, 4)]);
    }
  });

  it("reads a wide header-less table as a table when a table format is forced", () => {
    const line = Array.from({ length: 12 }, (_, j) => j).join(",");
    const t = parse(`${line}\n${line}\n`, "wide.csv", { format: "csv" });
    expect([t.format, t.columns.length, t.rowCount]).toEqual(["csv", 12, 2]);
  });

  it("reads narrow header-less tables as tables unless matrix is forced", () => {
    expect(parse("1 2 3\n4 5 6\n", "a.txt").format).toBe("text");
    const t = parse("1 2 3\n4 5 6\n", "a.txt", { format: "matrix" });
    expect(t.format).toBe("matrix");
    expect(col(t, "value")).toEqual([1, 2, 3, 4, 5, 6]);
  });
});
