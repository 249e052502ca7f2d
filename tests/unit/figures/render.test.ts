import http from "node:http";
import type { AddressInfo } from "node:net";
import { crc32 } from "node:zlib";
import { afterAll, describe, expect, it } from "vitest";
import { FIGURE_TEMPLATES } from "@/lib/figures/templates";
import { composeFigure } from "@/lib/server/render/compose-figure";
import { renderFigureInWorker, renderSpecInWorker, stopRenderWorkers } from "@/lib/server/render/render-in-worker";
import { RenderError, renderSpecToSvg } from "@/lib/server/render/render-spec-svg";
import { svgToPng } from "@/lib/server/render/to-png";
import { svgToPdf } from "@/lib/server/render/to-pdf";
import { scatterRows, scatterSpec, TEMPLATE_DATA, templateSpec } from "./fixtures";

afterAll(stopRenderWorkers);

const rootOf = (svg: string) => /^<svg\b[^>]*>/.exec(svg)![0];

async function renderError(p: Promise<unknown>): Promise<RenderError> {
  try {
    await p;
  } catch (err) {
    expect(err).toBeInstanceOf(RenderError);
    return err as RenderError;
  }
  throw new Error("expected the render to fail");
}

describe("renderSpecToSvg", () => {
  it("gives the SVG its physical size in mm with a viewBox in pt", async () => {
    const r = await renderSpecToSvg(scatterSpec(), { trace: scatterRows(200) }, { widthMm: 89, heightMm: 60 });
    const root = rootOf(r.svg);
    expect(root).toContain('width="89mm"');
    expect(root).toContain('height="60mm"');
    expect(root).toMatch(/viewBox="0 0 252\.283 170\.079"/);
    expect(r.widthPx).toBeCloseTo(252.283, 2);
    expect(r.heightMm).toBe(60);
  });

  it("draws all text in Inter", async () => {
    const r = await renderSpecToSvg(scatterSpec(), { trace: scatterRows(50) }, { widthMm: 89 });
    const families = new Set([...r.svg.matchAll(/font-family="([^"]+)"/g)].map((m) => m[1]));
    expect([...families]).toEqual(["Inter"]);
    expect(r.svg).toMatch(/<text[^>]*font-family="Inter"[^>]*font-size="7px"/);
  });

  it("renders every builder template at 89 mm, composite ones included", async () => {
    for (const t of FIGURE_TEMPLATES) {
      const r = await renderSpecToSvg(t.build({}), TEMPLATE_DATA, { widthMm: 89 });
      expect(rootOf(r.svg), t.id).toContain('width="89mm"');
      expect(r.widthPx, t.id).toBeCloseTo(252.28, 0);
      expect(r.svg.length, t.id).toBeGreaterThan(2000);
    }
  });

  it("fits composite views that set no size to the printed width without shrinking their text", async () => {
    const view = (field: string) => ({ mark: "point", encoding: { x: { field: "t", type: "quantitative" }, y: { field, type: "quantitative" } } });
    const spec = { data: { name: "trace" }, hconcat: [view("s"), view("s"), view("s")], config: { axis: { labelFontSize: 7 } } };
    const r = await renderSpecToSvg(spec, { trace: scatterRows(30) }, { widthMm: 183 });
    expect(r.widthPx).toBeGreaterThan(((183 * 72) / 25.4) * 0.98);
    expect(r.widthPx).toBeLessThan(((183 * 72) / 25.4) * 1.02);
  });

  it("is byte-for-byte the same on every render (Vega's global id counters are renumbered)", async () => {
    const spec = templateSpec("pl-map");
    const first = await renderSpecToSvg(spec, TEMPLATE_DATA, { widthMm: 89 });
    await renderSpecToSvg(templateSpec("spectrum"), TEMPLATE_DATA, { widthMm: 89 });
    const again = await renderSpecToSvg(spec, TEMPLATE_DATA, { widthMm: 89 });
    expect(first.svg).toContain('fill="url(#gradient_0)"');
    expect(again.svg).toBe(first.svg);
  });

  it("refuses every load: data URLs to loopback and file URLs fail the render and nothing is fetched", async () => {
    let requests = 0;
    const server = http.createServer((_, res) => {
      requests++;
      res.end("[]");
    });
    await new Promise<void>((r) => server.listen(0, "127.0.0.1", r));
    const port = (server.address() as AddressInfo).port;
    try {
      for (const url of [`http://127.0.0.1:${port}/api/me`, "file:///etc/passwd", "/etc/passwd"]) {
        const spec = { ...scatterSpec(), data: { url } };
        const err = await renderError(renderSpecToSvg(spec, {}, { widthMm: 89 }));
        expect(err.code).toBe("load-refused");
        expect(err.message).toContain(url);
      }
      const layered = {
        layer: [
          { ...scatterSpec(), data: { name: "trace" } },
          { ...scatterSpec(), data: { url: `http://127.0.0.1:${port}/x.json` } },
        ],
      };
      expect((await renderError(renderSpecToSvg(layered, { trace: scatterRows(5) }, { widthMm: 89 }))).code).toBe("load-refused");
      expect(requests).toBe(0);
    } finally {
      server.close();
    }
  });

  it("says which bound data is missing, and rejects sizes it will not print", async () => {
    expect((await renderError(renderSpecToSvg(scatterSpec(), {}, { widthMm: 89 }))).code).toBe("missing-data");
    expect((await renderError(renderSpecToSvg(scatterSpec(), { trace: [] }, { widthMm: 5 }))).code).toBe("bad-size");
  });
});

describe("the render worker (separate process, time and memory budget)", () => {
  it("renders the same SVG as the in-process renderer", async () => {
    const data = { trace: scatterRows(300) };
    const inWorker = await renderSpecInWorker(scatterSpec(), data, { widthMm: 89 });
    const inProcess = await renderSpecToSvg(scatterSpec(), data, { widthMm: 89 });
    expect(inWorker.svg).toBe(inProcess.svg);
  });

  it("reports loader refusals from inside the worker", async () => {
    const err = await renderError(renderSpecInWorker({ ...scatterSpec(), data: { url: "http://127.0.0.1:3000/api/me" } }, {}, { widthMm: 89 }));
    expect(err.code).toBe("load-refused");
  });

  it("stops a huge sequence at the time budget and reports a timeout", async () => {
    const huge = {
      data: { sequence: { start: 0, stop: 1e8, as: "v" } },
      transform: [{ calculate: "datum.v * 2", as: "w" }],
      mark: "point",
      encoding: { x: { field: "v", type: "quantitative" }, y: { field: "w", type: "quantitative" } },
    };
    // The behaviour under test is the code: the worker is stopped and "timeout" reported. How soon
    // after the budget that happens is machine speed, not asserted here.
    const err = await renderError(renderSpecInWorker(huge, {}, { widthMm: 89 }, { timeoutMs: 800, maxOldGenerationSizeMb: 2048 }));
    expect(err.code).toBe("timeout");
    // The next job gets a fresh worker.
    const ok = await renderSpecInWorker(scatterSpec(), { trace: scatterRows(10) }, { widthMm: 89 });
    expect(ok.svg).toContain('width="89mm"');
  });

  it("reports out-of-memory without taking this process down", async () => {
    const huge = { data: { sequence: { start: 0, stop: 1e8, as: "v" } }, mark: "point", encoding: { x: { field: "v", type: "quantitative" } } };
    const err = await renderError(renderSpecInWorker(huge, {}, { widthMm: 89 }, { timeoutMs: 20_000, maxOldGenerationSizeMb: 64 }));
    expect(err.code).toBe("out-of-memory");
  });
});

/** The PNG's chunks, with their CRCs checked against node:zlib's CRC-32 (not the renderer's own). */
function pngChunks(png: Buffer): Array<{ type: string; data: Buffer }> {
  expect([...png.subarray(0, 8)]).toEqual([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]);
  const out: Array<{ type: string; data: Buffer }> = [];
  for (let off = 8; off < png.length;) {
    const len = png.readUInt32BE(off);
    const type = png.toString("latin1", off + 4, off + 8);
    const data = png.subarray(off + 8, off + 8 + len);
    expect(png.readUInt32BE(off + 8 + len), `${type} CRC`).toBe(crc32(png.subarray(off + 4, off + 8 + len)));
    out.push({ type, data });
    off += 12 + len;
  }
  return out;
}

describe("PNG export", () => {
  it("is 1051 px wide for 89 mm at 300 dpi, with pHYs = 11811 px/m, placed before the image data", async () => {
    const r = await renderSpecToSvg(scatterSpec(), { trace: scatterRows(100) }, { widthMm: 89, heightMm: 60 });
    const { png, widthPx, heightPx } = svgToPng(r.svg, { dpi: 300 });
    const chunks = pngChunks(png);
    const ihdr = chunks[0]!;
    expect(ihdr.type).toBe("IHDR");
    expect(ihdr.data.readUInt32BE(0)).toBe(1051);
    expect(ihdr.data.readUInt32BE(4)).toBe(Math.round((60 / 25.4) * 300)); // 709
    expect([widthPx, heightPx]).toEqual([1051, 709]);
    const types = chunks.map((c) => c.type);
    expect(types.filter((t) => t === "pHYs")).toHaveLength(1);
    expect(types.indexOf("pHYs")).toBeLessThan(types.indexOf("IDAT"));
    const phys = chunks.find((c) => c.type === "pHYs")!.data;
    expect([phys.readUInt32BE(0), phys.readUInt32BE(4), phys.readUInt8(8)]).toEqual([11811, 11811, 1]);
  });

  it("doubles to 2102 px and 23622 px/m at 600 dpi", async () => {
    const r = await renderSpecToSvg(scatterSpec(), { trace: scatterRows(20) }, { widthMm: 89 });
    const chunks = pngChunks(svgToPng(r.svg, { dpi: 600 }).png);
    expect(chunks[0]!.data.readUInt32BE(0)).toBe(2102);
    expect(chunks.find((c) => c.type === "pHYs")!.data.readUInt32BE(0)).toBe(23622);
  });

  it("draws text with the shipped Inter, whatever family the SVG asks for", () => {
    const frame = (text: string) =>
      `<svg xmlns="http://www.w3.org/2000/svg" width="30mm" height="10mm" viewBox="0 0 85 28"><rect width="85" height="28" fill="white"/>${text}</svg>`;
    const blank = svgToPng(frame(""), { dpi: 300 }).png;
    const inter = svgToPng(frame('<text x="2" y="18" font-family="Inter" font-size="12">T₂ = 42 µs</text>'), { dpi: 300 }).png;
    const other = svgToPng(frame('<text x="2" y="18" font-family="Comic Sans MS" font-size="12">T₂ = 42 µs</text>'), { dpi: 300 }).png;
    expect(inter.equals(blank)).toBe(false);
    expect(other.equals(inter)).toBe(true);
  });

  it("refuses SVGs that reference files or other documents", () => {
    for (const bad of [
      '<svg xmlns="http://www.w3.org/2000/svg" width="10mm" height="10mm"><image href="file:///etc/passwd" width="10" height="10"/></svg>',
      '<svg xmlns="http://www.w3.org/2000/svg" width="10mm" height="10mm"><use href="other.svg#x"/></svg>',
      '<svg xmlns="http://www.w3.org/2000/svg" width="10mm" height="10mm"><rect fill="url(/etc/passwd)"/></svg>',
    ]) {
      expect(() => svgToPng(bad)).toThrow(/not exported/);
    }
  });
});

describe("PDF export", () => {
  it("is a PDF whose MediaBox is the figure size in points, with Inter embedded and no images", async () => {
    const r = await renderSpecToSvg(templateSpec("decay-curve", { sigmaField: "sigma" }), TEMPLATE_DATA, { widthMm: 89, heightMm: 70 });
    const pdf = await svgToPdf(r.svg, { title: "Figure 1", creationDate: new Date("2026-01-01T00:00:00Z") });
    const text = pdf.toString("latin1");
    expect(text.startsWith("%PDF-")).toBe(true);
    const box = /\/MediaBox \[([^\]]+)\]/.exec(text)![1]!.trim().split(/\s+/).map(Number);
    expect(box[0]).toBe(0);
    expect(box[1]).toBe(0);
    expect(box[2]).toBeCloseTo(252.28, 2);
    expect(box[3]).toBeCloseTo((70 * 72) / 25.4, 2);
    expect(text).toMatch(/\/BaseFont \/[A-Z]{6}\+Inter-Regular/);
    expect(text).toContain("/FontFile2");
    expect(text).not.toMatch(/\/Subtype \/Image/);
    expect(text).not.toMatch(/Helvetica/);
  });

  it("refuses an SVG with an image, instead of reading the path from disk", async () => {
    const bad =
      '<svg xmlns="http://www.w3.org/2000/svg" width="10mm" height="10mm" viewBox="0 0 28 28"><image href="/etc/passwd" width="10" height="10"/></svg>';
    await expect(svgToPdf(bad)).rejects.toThrow(/not exported/);
  });
});

describe("figure composition", () => {
  const clipped = () => ({
    ...scatterSpec(),
    mark: { type: "line", clip: true },
    encoding: { ...scatterSpec().encoding, x: { field: "t", type: "quantitative", scale: { domain: [0, 0.5] } } },
  });

  it("places panels a and b side by side with bold 8 pt letters, unique ids and a root in mm", async () => {
    const data = { trace: scatterRows(100) };
    const a = await renderSpecToSvg(clipped(), data, { widthMm: 89 });
    const b = await renderSpecToSvg(clipped(), data, { widthMm: 89 });
    expect(a.svg).toMatch(/clip-path="url\(#/);
    const fig = composeFigure(
      [
        { letter: "a", ...a },
        { letter: "b", ...b },
      ],
      { columns: 2, gapMm: 5 },
      183,
    );
    const root = rootOf(fig.svg);
    expect(root).toContain('width="183mm"');
    expect(root).toMatch(/height="[\d.]+mm"/);
    const letters = [...fig.svg.matchAll(/<text x="([\d.]+)" y="([\d.]+)" font-family="Inter" font-weight="bold" font-size="8"[^>]*>([ab])<\/text>/g)];
    expect(letters.map((m) => m[3])).toEqual(["a", "b"]);
    expect(Number(letters[0]![1])).toBe(0);
    expect(Number(letters[1]![1])).toBeCloseTo(((89 + 5) * 72) / 25.4, 2);
    const nested = [...fig.svg.matchAll(/<svg x="([\d.]+)" y="([\d.]+)" width="([\d.]+)"/g)];
    expect(nested).toHaveLength(2);
    expect(Number(nested[1]![1])).toBeCloseTo(((89 + 5) * 72) / 25.4, 2);
    expect(Number(nested[0]![3])).toBeCloseTo((89 * 72) / 25.4, 2);
    const ids = [...fig.svg.matchAll(/\sid="([^"]+)"/g)].map((m) => m[1]!);
    expect(new Set(ids).size).toBe(ids.length);
    for (const ref of fig.svg.matchAll(/url\(#([^)]+)\)/g)) expect(ids).toContain(ref[1]);
    expect(ids.some((id) => id.startsWith("pa-"))).toBe(true);
    expect(ids.some((id) => id.startsWith("pb-"))).toBe(true);
    // The composed figure exports like a panel.
    expect(svgToPng(fig.svg, { dpi: 300 }).widthPx).toBe(Math.round((183 / 25.4) * 300));
    expect((await svgToPdf(fig.svg)).toString("latin1", 0, 5)).toBe("%PDF-");
  });

  it("wraps to a new row and honours spans; the worker renders and composes a whole figure", async () => {
    const fig = await renderFigureInWorker(
      [
        { letter: "a", spec: templateSpec("decay-curve"), data: TEMPLATE_DATA },
        { letter: "b", spec: templateSpec("spectrum"), data: TEMPLATE_DATA },
        { letter: "c", spec: templateSpec("group-strip"), data: TEMPLATE_DATA, span: 2 },
      ],
      { columns: 2 },
      183,
    );
    expect(fig.widthMm).toBe(183);
    const nested = [...fig.svg.matchAll(/<svg x="([\d.]+)" y="([\d.]+)" width="([\d.]+)"/g)].map((m) => m.slice(1).map(Number));
    expect(nested).toHaveLength(3);
    expect(nested[2]![0]).toBe(0);
    expect(nested[2]![1]).toBeGreaterThan(nested[0]![1]!);
    expect(nested[2]![2]).toBeCloseTo((183 * 72) / 25.4, 1);
    expect([...fig.svg.matchAll(/font-weight="bold" font-size="8"[^>]*>([abc])</g)].map((m) => m[1])).toEqual(["a", "b", "c"]);
  });
});
