import { describe, expect, it } from "vitest";
import { contentDisposition, sanitiseFileName } from "@/lib/server/storage/file-name";

describe("sanitiseFileName", () => {
  it("removes every bidi control character", () => {
    expect(sanitiseFileName("a\u200Eb\u200Fc\u202Ad\u202Be\u202Cf\u202Dg\u202Eh\u2066i\u2067j\u2068k\u2069l\u061Cm.csv")).toBe("abcdefghijklm.csv");
    expect(sanitiseFileName("invoice\u202Egnp.exe")).toBe("invoicegnp.exe");
  });

  it("removes control and other format characters, separators and lone surrogates", () => {
    expect(sanitiseFileName("tab\there\r\nnew\u0000.csv")).toBe("tabherenew.csv");
    expect(sanitiseFileName("c1\u0085\u009b.csv")).toBe("c1.csv");
    expect(sanitiseFileName("zero\u200Bwidth\u200C\u200D\uFEFF\u00AD\u2060.csv")).toBe("zerowidth.csv");
    expect(sanitiseFileName("line\u2028para\u2029.csv")).toBe("linepara.csv");
    expect(sanitiseFileName("bad\uD800half\uDC00.csv")).toBe("badhalf.csv");
  });

  it("keeps only the last path segment, trims, and never answers an empty or dot name", () => {
    expect(sanitiseFileName("C:\\Users\\mira\\data.csv")).toBe("data.csv");
    expect(sanitiseFileName("../../etc/passwd")).toBe("passwd");
    expect(sanitiseFileName("  spaced .csv  ")).toBe("spaced .csv");
    expect(sanitiseFileName(undefined)).toBe("upload");
    expect(sanitiseFileName("")).toBe("upload");
    expect(sanitiseFileName("\u202E\u200B")).toBe("upload");
    expect(sanitiseFileName("..")).toBe("upload");
    expect(sanitiseFileName("dir/.")).toBe("upload");
  });

  it("keeps letters, accents and emoji, composed (NFC), at most 200 characters", () => {
    expect(sanitiseFileName("spectre été ✓ 🙂.csv")).toBe("spectre été ✓ 🙂.csv");
    expect(sanitiseFileName("e\u0301te\u0301.csv")).toBe("\u00e9t\u00e9.csv");
    expect(sanitiseFileName("🙂".repeat(250))).toBe("🙂".repeat(200));
  });
});

describe("contentDisposition", () => {
  it("gives an ASCII fallback and an RFC 5987 UTF-8 name", () => {
    expect(contentDisposition("spectre été ✓.csv")).toBe(`attachment; filename="spectre _t_ _.csv"; filename*=UTF-8''spectre%20%C3%A9t%C3%A9%20%E2%9C%93.csv`);
    expect(contentDisposition("🙂.csv")).toBe(`attachment; filename="_.csv"; filename*=UTF-8''%F0%9F%99%82.csv`);
  });

  it("escapes quotes, apostrophes, brackets and stars", () => {
    expect(contentDisposition(`say "hi" it's (1)*.csv`)).toBe(
      `attachment; filename="say _hi_ it's (1)*.csv"; filename*=UTF-8''say%20%22hi%22%20it%27s%20%281%29%2A.csv`,
    );
  });

  it("cleans the name first, so a stored name with bidi or control characters cannot reach the header", () => {
    expect(contentDisposition("report\u2067\u202Eslx.exe\u2069 (final).csv")).toBe(
      `attachment; filename="reportslx.exe (final).csv"; filename*=UTF-8''reportslx.exe%20%28final%29.csv`,
    );
    expect(contentDisposition("a\r\nSet-Cookie: x=1.csv")).toBe(`attachment; filename="aSet-Cookie: x=1.csv"; filename*=UTF-8''aSet-Cookie%3A%20x%3D1.csv`);
    expect(contentDisposition("bad\uD800.csv")).toBe(`attachment; filename="bad.csv"; filename*=UTF-8''bad.csv`);
  });
});
