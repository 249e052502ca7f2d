import { createHash } from "node:crypto";
import { unzipSync, strFromU8 } from "fflate";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { desc, eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { auditLog } from "@/db/schema";
import { DEMO_MANUSCRIPT_ID } from "@/lib/demo-data/accounts";
import { hahnEchoFiles } from "@/lib/demo-data/hahn-echo";
import { stopRenderWorkers } from "@/lib/server/render/render-in-worker";
import * as upload from "@/app/api/manuscripts/[id]/datasets/route";
import * as analyses from "@/app/api/analyses/route";
import * as figuresRoute from "@/app/api/figures/route";
import * as panelsRoute from "@/app/api/figures/[id]/panels/route";
import * as revisions from "@/app/api/panels/[id]/revisions/route";
import { call, setupTestApp, uploadForm, type Who } from "./harness";

let tokens: Record<Who, string>;
let figureId: string;
let echoVersionId: string;
const VL = "https://vega.github.io/schema/vega-lite/v6.json";

async function download(path: string, who: Who = "viewer") {
  const { GET } = await import("@/app/api/figures/[id]/export/route");
  const res = await GET(new Request(`http://localhost${path}`, { headers: { authorization: `Bearer ${tokens[who]}` } }), {
    params: Promise.resolve({ id: figureId }),
  });
  return { status: res.status, headers: res.headers, bytes: new Uint8Array(await res.arrayBuffer()) };
}

beforeAll(async () => {
  ({ tokens } = await setupTestApp());
  const echo = hahnEchoFiles()[0]!;
  const v = (
    await call(upload.POST, { method: "POST", token: tokens.author, params: { id: DEMO_MANUSCRIPT_ID }, rawBody: uploadForm(echo.fileName, echo.content) })
  ).json;
  echoVersionId = v.id;
  const fit = (
    await call(analyses.POST, {
      method: "POST",
      token: tokens.author,
      body: { versionId: v.id, model: "hahn_echo", options: { x: "tau", y: "signal", sigma: "sigma" } },
    })
  ).json;
  figureId = (
    await call(figuresRoute.POST, {
      method: "POST",
      token: tokens.author,
      body: { manuscriptId: DEMO_MANUSCRIPT_ID, title: "Coherence", widthMm: 183, columns: 2 },
    })
  ).json.id;
  const add = async () => (await call(panelsRoute.POST, { method: "POST", token: tokens.author, params: { id: figureId }, body: {} })).json.id;
  const a = await add();
  const b = await add();
  const enc = {
    x: { field: "tau", type: "quantitative", title: "τ (µs)", scale: { type: "log" } },
    y: { field: "signal", type: "quantitative", title: "signal (norm.)" },
  };
  await call(revisions.POST, {
    method: "POST",
    token: tokens.author,
    params: { id: a },
    body: {
      baseRevisionId: null,
      bindings: { echo: { versionId: v.id }, fit: { analysisId: fit.id, output: "curve" } },
      spec: {
        $schema: VL,
        width: 200,
        height: 140,
        layer: [
          { data: { name: "echo" }, mark: "point", encoding: enc },
          { data: { name: "fit" }, mark: "line", encoding: enc },
        ],
      },
    },
  });
  await call(revisions.POST, {
    method: "POST",
    token: tokens.author,
    params: { id: b },
    body: {
      baseRevisionId: null,
      bindings: { res: { analysisId: fit.id, output: "residuals" } },
      spec: {
        $schema: VL,
        width: 200,
        height: 140,
        data: { name: "res" },
        mark: "point",
        encoding: { x: { field: "tau", type: "quantitative", scale: { type: "log" } }, y: { field: "signal", type: "quantitative", title: "residual" } },
      },
    },
  });
}, 120_000);
afterAll(async () => {
  await stopRenderWorkers();
});

describe("figure exports", () => {
  it("SVG with live text: the physical width, the panel letters, and the font it uses embedded", async () => {
    const r = await download(`/x?format=svg&text=embedded`);
    expect(r.status).toBe(200);
    const svg = strFromU8(r.bytes);
    expect(svg).toMatch(/<svg[^>]*width="183mm"/);
    expect(svg).toMatch(/font-family="?[^">]*Inter/);
    expect(svg).toMatch(/>a<\/text>/);
    expect(svg).toMatch(/>b<\/text>/);
    expect(r.headers.get("x-figure-hash")).toMatch(/^[0-9a-f]{64}$/);
    // The embedded faces are TrueType files (sfnt version 0x00010000, OpenType spec "Font file" table directory).
    const faces = [...svg.matchAll(/@font-face\{font-family:"([^"]+)";font-weight:(\w+);[^}]*base64,([A-Za-z0-9+/=]+)\)/g)];
    expect(faces.map((f) => `${f[1]} ${f[2]}`).sort()).toEqual(["Inter bold", "Inter normal"]); // letters bold, labels regular
    for (const f of faces) expect(Buffer.from(f[3]!, "base64").readUInt32BE(0)).toBe(0x00010000);
  });

  it("SVG by default has its text as outlines: no text elements, no font needed, same size", async () => {
    const svg = strFromU8((await download(`/x?format=svg`)).bytes);
    expect(svg).toMatch(/<svg[^>]*width="183mm"/);
    expect(svg).not.toMatch(/<text\b/);
    expect(svg).not.toMatch(/font-family/);
    expect(svg.match(/<path\b/g)!.length).toBeGreaterThan(100); // glyphs, marks and axes
  });

  it("tick labels carry no thousands separators, as journals print them", async () => {
    const svg = strFromU8((await download(`/x?format=svg&text=embedded`)).bytes);
    expect(svg).toMatch(/>1000<\/text>/); // the τ axis runs from 1 to 2000 µs
    expect(svg).not.toMatch(/>-?\d{1,3}(,\d{3})+(\.\d+)?<\/text>/);
  });

  it("PDF sized in points, PNG with the right pixels and DPI", async () => {
    const pdf = await download(`/x?format=pdf`);
    expect(strFromU8(pdf.bytes.slice(0, 5))).toBe("%PDF-");
    const mediaBox = /\/MediaBox \[0 0 ([\d.]+) ([\d.]+)\]/.exec(strFromU8(pdf.bytes))!;
    expect(Number(mediaBox[1])).toBeCloseTo((183 / 25.4) * 72, 1); // 183 mm = 518.74 pt
    const png = await download(`/x?format=png&dpi=600`);
    const view = new DataView(png.bytes.buffer, png.bytes.byteOffset);
    expect(view.getUint32(16)).toBe(Math.round((183 / 25.4) * 600)); // IHDR width: 4323 px
    const phys = Buffer.from(png.bytes).indexOf("pHYs");
    expect(view.getUint32(phys + 4)).toBe(Math.round(600 / 0.0254)); // 23622 px/m
    expect((await download(`/x?format=png&dpi=72`)).status).toBe(400);
  });

  it("a figure not signed off says so: a strip under the SVG, the PNG's Description, the PDF's Subject; the exporter may leave the mark out, on record", async () => {
    const r = await download(`/x?format=svg&text=embedded`);
    expect(r.headers.get("x-signed-off")).toBe("no");
    const svg = strFromU8(r.bytes);
    expect(svg).toMatch(/>Not signed off — draft for review · figure hash [0-9a-f]{12}<\/text><\/svg>$/);
    const plain = await download(`/x?format=svg&text=embedded&mark=off`);
    expect(strFromU8(plain.bytes)).not.toContain("Not signed off");
    // The strip adds 3 mm below the figure: the marked SVG is exactly 3 mm taller.
    const height = (s: string) => Number(/<svg[^>]*\sheight="([\d.]+)mm"/.exec(s)![1]);
    expect(height(svg) - height(strFromU8(plain.bytes))).toBeCloseTo(3, 6);
    const png = Buffer.from((await download(`/x?format=png&dpi=1200`)).bytes);
    const view = new DataView(png.buffer, png.byteOffset);
    const phys = png.indexOf("pHYs");
    expect(view.getUint32(phys + 4)).toBe(47244); // 1200 dpi = 1200 / 0.0254 m = 47244.09 px/m (PNG spec §11.3.5.3)
    const text = png.indexOf("tEXt");
    expect(png.toString("latin1", text + 4, text + 4 + 46)).toBe("Description\0Not signed off - draft for review;");
    const pdf = strFromU8((await download(`/x?format=pdf`)).bytes);
    expect(pdf).toMatch(/\/Subject/);
    const [entry] = await getDb().select().from(auditLog).where(eq(auditLog.action, "figure.export")).orderBy(desc(auditLog.seq)).limit(1);
    // The audit entry's data is stored as JSON text.
    expect(JSON.parse(String(entry!.data))).toMatchObject({ format: "pdf", signedOff: false, draftMark: true });
    const exports = await getDb().select().from(auditLog).where(eq(auditLog.action, "figure.export"));
    const leftOut = exports.filter((e) => (JSON.parse(String(e.data)) as { draftMarkLeftOut?: boolean }).draftMarkLeftOut);
    expect(leftOut).toHaveLength(1);
  });

  it("source data as a workbook: one sheet per panel, named for download", async () => {
    const r = await download(`/x?format=xlsx`);
    expect(r.status).toBe(200);
    expect(r.headers.get("content-disposition")).toBe('attachment; filename="figure-1.source-data.xlsx"');
    const files = unzipSync(r.bytes); // an .xlsx is a zip of SpreadsheetML parts (ECMA-376 Part 2)
    expect(Object.keys(files)).toEqual(expect.arrayContaining(["xl/workbook.xml", "xl/worksheets/sheet1.xml", "xl/worksheets/sheet2.xml"]));
    expect(strFromU8(files["xl/workbook.xml"]!)).toMatch(/name="Panel a"[^]*name="Panel b"/);
  });

  it("source data: every point, one CSV per panel and data name, with a README of hashes", async () => {
    const r = await download(`/x?format=source-data`);
    const files = unzipSync(r.bytes);
    expect(Object.keys(files).sort()).toEqual(["README.txt", "figure-1-panel-a-echo.csv", "figure-1-panel-a-fit.csv", "figure-1-panel-b-res.csv"]);
    expect(strFromU8(files["figure-1-panel-a-echo.csv"]!).trim().split("\n")).toHaveLength(81); // 80 points + header
    // Units back in every header, as the uploaded file named them ("tau (µs),signal (norm),sigma (norm)").
    expect(strFromU8(files["figure-1-panel-a-echo.csv"]!).split("\n")[0]).toBe("tau (µs),signal (norm),sigma (norm)");
    expect(strFromU8(files["figure-1-panel-a-fit.csv"]!).split("\n")[0]).toBe("series,tau (µs),signal (norm)"); // the curve's rows
    expect(strFromU8(files["README.txt"]!)).toMatch(/Figure hash: [0-9a-f]{64}/);
  });

  it("the bundle is an RO-Crate 1.2 naming every file by hash and each analysis as a CreateAction", async () => {
    const files = unzipSync((await download(`/x?format=bundle`, "reviewer")).bytes);
    const crate = JSON.parse(strFromU8(files["ro-crate-metadata.json"]!));
    expect(crate["@context"]).toBe("https://w3id.org/ro/crate/1.2/context");
    const graph: any[] = crate["@graph"];
    const rawFile = graph.find((e) => e["@type"] === "File" && String(e["@id"]).startsWith("raw/"));
    expect(files[rawFile["@id"]]).toBeTruthy();
    expect(rawFile.sha256).toBe(createHash("sha256").update(files[rawFile["@id"]]!).digest("hex")); // the bytes in the bundle
    expect(graph.find((e) => e["@type"] === "CreateAction")).toMatchObject({ name: "hahn_echo fit of echo_K17-NV01.csv, version 1" });
    for (const f of ["figure.svg", "figure.pdf", "trace.json", "specs/panel-a.vl.json"]) expect(files[f], f).toBeTruthy();
  });

  it("outsiders get 404; an unknown format names the field", async () => {
    expect((await download(`/x?format=svg`, "outsider")).status).toBe(404);
    const bad = await download(`/x?format=eps`);
    expect(bad.status).toBe(400);
    expect(new TextDecoder().decode(bad.bytes)).toContain("format must be svg, pdf, png, tiff, xlsx, source-data or bundle");
  });
});

/** The IFD0 entries of a TIFF (TIFF 6.0 §2: header, then 12-byte entries tag/type/count/value); rationals read through their offset. */
function tiffTags(bytes: Uint8Array): Map<number, number> {
  const b = Buffer.from(bytes);
  const le = b.toString("latin1", 0, 2) === "II";
  const u16 = (o: number) => (le ? b.readUInt16LE(o) : b.readUInt16BE(o));
  const u32 = (o: number) => (le ? b.readUInt32LE(o) : b.readUInt32BE(o));
  expect(u16(2)).toBe(42);
  const ifd = u32(4);
  const tags = new Map<number, number>();
  for (let i = 0; i < u16(ifd); i++) {
    const e = ifd + 2 + 12 * i;
    const type = u16(e + 2);
    const value = type === 3 ? u16(e + 8) : type === 5 ? u32(u32(e + 8)) / u32(u32(e + 8) + 4) : u32(e + 8);
    tags.set(u16(e), value);
  }
  return tags;
}

describe("raster files for print", () => {
  it("PNG in RGB or greyscale, never with an alpha channel (IHDR colour type, PNG spec §11.2.2)", async () => {
    const colourType = (bytes: Uint8Array) => bytes[25];
    expect(colourType((await download(`/x?format=png&dpi=300`)).bytes)).toBe(2); // truecolour, no alpha
    const grey = await download(`/x?format=png&dpi=300&colour=grey`);
    expect(colourType(grey.bytes)).toBe(0); // greyscale
    expect(grey.headers.get("content-disposition")).toBe('attachment; filename="figure-1.300dpi-grey.png"');
    expect((await download(`/x?format=png&colour=cmyk`)).status).toBe(400);
  });

  it("TIFF with LZW compression at the asked resolution, RGB or greyscale (TIFF 6.0 tags 259, 262, 277, 282, 296)", async () => {
    const rgb = await download(`/x?format=tiff&dpi=600`);
    expect(rgb.headers.get("content-type")).toBe("image/tiff");
    const t = tiffTags(rgb.bytes);
    expect(t.get(259)).toBe(5); // Compression: LZW
    expect(t.get(262)).toBe(2); // PhotometricInterpretation: RGB
    expect(t.get(277)).toBe(3); // SamplesPerPixel: no alpha
    expect(t.get(256)).toBe(Math.round((183 / 25.4) * 600)); // ImageWidth: 4323 px
    expect(t.get(282)).toBeCloseTo(600, 6); // XResolution
    expect(t.get(296)).toBe(2); // ResolutionUnit: inch
    const g = tiffTags((await download(`/x?format=tiff&dpi=300&colour=grey`)).bytes);
    expect([g.get(259), g.get(262), g.get(277), g.get(282)]).toEqual([5, 1, 1, 300]); // LZW, BlackIsZero, one sample, 300 dpi
  });
});

describe("in the manuscript's house style", () => {
  const arimo = { font: "Arimo", labelPt: 6, titlePt: 7, axisLinePt: 0.5, dataLinePt: 0.75, letterPt: 9, letterCase: "upper", letterWeight: "normal" };
  let houseStyle: typeof import("@/app/api/manuscripts/[id]/house-style/route");
  beforeAll(async () => {
    houseStyle = await import("@/app/api/manuscripts/[id]/house-style/route");
  });

  it("starts at the templates' own sizes; a viewer can read it but not set it", async () => {
    const r = await call(houseStyle.GET, { method: "GET", token: tokens.viewer, params: { id: DEMO_MANUSCRIPT_ID } });
    expect(r.json.style).toEqual({
      font: "Inter",
      labelPt: 7,
      titlePt: 8,
      axisLinePt: 0.6,
      dataLinePt: null,
      letterPt: 8,
      letterCase: "lower",
      letterWeight: "bold",
    });
    const refused = await call(houseStyle.PUT, { method: "PUT", token: tokens.viewer, params: { id: DEMO_MANUSCRIPT_ID }, body: arimo });
    expect(refused.status).toBe(403);
  });

  it("an author sets Arimo, 6/7 pt, 0.5 pt axes, 0.75 pt lines and upright capitals; every export follows", async () => {
    const set = await call(houseStyle.PUT, { method: "PUT", token: tokens.author, params: { id: DEMO_MANUSCRIPT_ID }, body: arimo });
    expect(set.status).toBe(200);
    expect(set.json.summary).toBe("Arimo, labels 6 pt, titles 7 pt, axes 0.5 pt, data lines 0.75 pt, letters A 9 pt normal");
    const svg = strFromU8((await download(`/x?format=svg&text=embedded`)).bytes);
    expect(svg).toMatch(/<text[^>]*font-family="Arimo" font-weight="normal" font-size="9"[^>]*>A<\/text>/);
    expect(svg).toMatch(/<text[^>]*font-family="Arimo" font-weight="normal" font-size="9"[^>]*>B<\/text>/);
    expect(svg).not.toMatch(/>a<\/text>/);
    expect(svg).toMatch(/font-family="Arimo"[^>]*font-size="6px"[^>]*>1000<\/text>/); // a tick label of the τ axis
    expect(svg).toMatch(/font-size="7px"[^>]*>τ \(µs\)<\/text>/); // the axis title
    expect(svg).not.toMatch(/font-size="7px"[^>]*>1000<\/text>/);
    expect(svg).toMatch(/class="mark-rule role-axis-domain"[^>]*>[^]*?stroke-width="0.5"/);
    expect(svg).toMatch(/class="mark-line role-mark[^"]*"[^>]*>[^]*?stroke-width="0.75"/);
    expect(svg).toContain('@font-face{font-family:"Arimo";font-weight:normal');
    const [entry] = await getDb().select().from(auditLog).where(eq(auditLog.action, "figure.export")).orderBy(desc(auditLog.seq)).limit(1);
    expect(JSON.parse(String(entry!.data))).toMatchObject({ format: "svg", text: "embedded", houseStyle: set.json.summary });
    const pdf = strFromU8((await download(`/x?format=pdf`)).bytes);
    expect(pdf).toMatch(/\/BaseFont \/[A-Z]{6}\+Arimo/); // the embedded subset (PDF 1.7 §9.6.4 subset tag)
  });

  it("a style outside journal sizes is refused field by field and nothing changes", async () => {
    const r = await call(houseStyle.PUT, { method: "PUT", token: tokens.author, params: { id: DEMO_MANUSCRIPT_ID }, body: { ...arimo, labelPt: 4 } });
    expect(r.status).toBe(400);
    expect(r.json.error.message).toContain("labelPt must be at least 5 pt");
    const now = await call(houseStyle.GET, { method: "GET", token: tokens.author, params: { id: DEMO_MANUSCRIPT_ID } });
    expect(now.json.style.labelPt).toBe(6);
  });
});

describe("one y-axis title per row", () => {
  it("draws a y title repeated across a row once when the figure shares them, on every panel when it does not", async () => {
    const figure = (
      await call(figuresRoute.POST, {
        method: "POST",
        token: tokens.author,
        body: { manuscriptId: DEMO_MANUSCRIPT_ID, title: "Shared titles", widthMm: 183, columns: 2 },
      })
    ).json;
    for (const _ of [1, 2]) {
      const panel = (await call(panelsRoute.POST, { method: "POST", token: tokens.author, params: { id: figure.id }, body: {} })).json;
      const r = await call(revisions.POST, {
        method: "POST",
        token: tokens.author,
        params: { id: panel.id },
        body: {
          baseRevisionId: null,
          bindings: { echo: { versionId: echoVersionId } },
          spec: {
            $schema: VL,
            width: 200,
            height: 140,
            data: { name: "echo" },
            mark: "point",
            encoding: { x: { field: "tau", type: "quantitative", title: "τ (µs)" }, y: { field: "signal", type: "quantitative", title: "echo amplitude" } },
          },
        },
      });
      expect(r.status).toBe(201);
    }
    const { GET } = await import("@/app/api/figures/[id]/export/route");
    const svgOf = async () => {
      const res = await GET(new Request(`http://localhost/x?format=svg&text=embedded`, { headers: { authorization: `Bearer ${tokens.viewer}` } }), {
        params: Promise.resolve({ id: figure.id }),
      });
      return await res.text();
    };
    const count = (svg: string) => svg.split(">echo amplitude</text>").length - 1;
    expect(count(await svgOf())).toBe(2);
    const patch = await call((await import("@/app/api/figures/[id]/route")).PATCH, {
      method: "PATCH",
      token: tokens.author,
      params: { id: figure.id },
      body: { shareYTitles: true },
    });
    expect(patch.json.shareYTitles).toBe(true);
    const shared = await svgOf();
    expect(count(shared)).toBe(1);
    expect(shared.split(">τ (µs)</text>").length - 1).toBe(2); // x titles stay on both
  });
});
