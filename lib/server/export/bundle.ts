import "server-only";
import { eq, inArray } from "drizzle-orm";
import { strToU8 } from "fflate";
import { getDb } from "@/db/client";
import { analyses, versions } from "@/db/schema";
import type { SessionUser } from "@/lib/authz";
import { canonicalJson } from "@/lib/figures/canonical-spec";
import { sha256Hex } from "../crypto";
import { loadBoundTables } from "../figures/bindings";
import { getRevision } from "../figures/revisions";
import { houseStyleOf } from "../house-style";
import { traceFigure, type FigureTrace } from "../figures/trace";
import { svgToPdf } from "../render/to-pdf";
import { printPng } from "../render/to-print-raster";
import type { FigureReview } from "../review/review-context";
import { blobStore } from "../storage/store";
import { DRAFT_MARK_TEXT } from "./draft-mark";
import { fitReportText, type StoredFit } from "./fit-report";
import { iso, lastChange, mediaTypeOf, putReviewActions, ref, type Entity } from "./crate-entities";
import { BUNDLE_PATHS, type BundleParseRecord, type BundleRender } from "./bundle-layout";
import { panelDataJson } from "./panel-data-json";
import { traceToProv, type RenderedFile } from "./prov";
import { SOFTWARE } from "./software";
import { ExportBody } from "./export-body";
import { sourceDataEntries } from "./source-data";
import { ZipFileWriter } from "./zip-writer";

/** RO-Crate 1.2 (https://w3id.org/ro/crate/1.2): the JSON-LD context and the version the metadata conforms to. */
const RO_CRATE_CONTEXT = "https://w3id.org/ro/crate/1.2/context";
const RO_CRATE_CONFORMS_TO = "https://w3id.org/ro/crate/1.2";

type Version = Extract<FigureTrace["panels"][number]["inputs"][number], { kind: "version" }>["version"];

/**
 * The reproducibility bundle as an RO-Crate 1.2 (ro-crate-metadata.json): the figure drawn as SVG, PDF and
 * 300 dpi PNG; every raw and derived file by hash; each panel's Vega-Lite spec and bindings; a report of
 * each fit (JSON and text); the source data; the trace as JSON and as W3C PROV-JSON (prov.json). Every
 * file carries contentSize, encodingFormat and sha256. Each fit, revision save and the drawing are
 * CreateActions (instrument: the software and model at their versions; object: inputs; result: outputs;
 * agent: a Person by name); review decisions are AssessActions, sign-offs EndorseActions.
 *
 * Deterministic: the same figure, drawn for the same person, gives the same bytes. Nothing in it reads
 * the clock: dates are those of the recorded events, and the PDF's creation date is the moment the
 * figure last changed; files are written in one order, each deflated in fixed blocks.
 *
 * Streamed: each file goes into the zip (a temporary file) as it is made, hashed on the way; raw
 * files are copied from the store as a stream and the panels' rows are written in blocks, so
 * memory does not grow with the data. ro-crate-metadata.json, which names every hash, comes last.
 */
export async function writeBundle(user: SessionUser, review: FigureReview, rendered: { svg: string; pdf: Uint8Array }): Promise<ExportBody> {
  const zip = new ZipFileWriter();
  try {
    await writeBundleFiles(zip, user, review, rendered);
    return ExportBody.ofTempFile(zip.path, await zip.finish());
  } catch (err) {
    await zip.discard();
    throw err;
  }
}

type Content = Uint8Array | Iterable<Uint8Array> | AsyncIterable<Uint8Array>;

async function writeBundleFiles(zip: ZipFileWriter, user: SessionUser, review: FigureReview, rendered: { svg: string; pdf: Uint8Array }): Promise<void> {
  const trace = await traceFigure(user, review.figure.id, { exports: false });
  const changedAt = lastChange(trace);
  const files = new Set<string>();
  const entities = new Map<string, Entity>();
  const put = (e: Entity) => {
    if (!entities.has(e["@id"])) entities.set(e["@id"], e);
    return ref(e["@id"]);
  };
  const addFile = async (path: string, content: Content, encodingFormat: string, props: Record<string, unknown> = {}) => {
    files.add(path);
    const { sha256, byteSize } = await zip.add(path, content);
    return put({
      "@id": path,
      "@type": "File",
      name: path.split("/").pop()!,
      contentSize: String(byteSize),
      encodingFormat,
      sha256,
      ...props,
    });
  };
  const personRef = (p: { id: string; name: string }) => put({ "@id": `#person-${p.id}`, "@type": "Person", name: p.name });
  const prooflight = put({ "@id": "#prooflight", "@type": "SoftwareApplication", name: SOFTWARE.prooflight.name, version: SOFTWARE.prooflight.version });
  const vega = put({ "@id": "#vega", "@type": "SoftwareApplication", name: SOFTWARE.vega.name, version: SOFTWARE.vega.version });
  const vegaLite = put({ "@id": "#vega-lite", "@type": "SoftwareApplication", name: SOFTWARE.vegaLite.name, version: SOFTWARE.vegaLite.version });

  // What the application recorded when it parsed each data file, and the rows each panel was drawn from.
  const parsed: Record<string, BundleParseRecord> = {};
  const versionFile = async (v: Version) => {
    const folder = v.derivedFromAnalysisId ? "derived" : "raw";
    const path = `${folder}/${v.sha256.slice(0, 12)}-${v.fileName.replace(/[^\w.-]+/g, "_")}`;
    if (files.has(path)) return ref(path);
    const [stored] = await getDb().select().from(versions).where(eq(versions.id, v.versionId));
    parsed[path] = {
      versionId: v.versionId,
      fileName: v.fileName,
      format: stored.parseInfo.format,
      encoding: stored.parseInfo.encoding,
      delimiter: stored.parseInfo.delimiter,
      decimal: stored.parseInfo.decimal,
      warnings: stored.parseInfo.warnings,
      rowCount: stored.rowCount,
      columns: stored.columns,
      summary: stored.summary,
    };
    return addFile(path, await blobStore().openRead(v.sha256), mediaTypeOf(v.fileName), {
      name: `${v.dataset}, version ${v.number}`,
      identifier: v.versionId,
      dateCreated: iso(v.createdAt),
      ...(v.derivedFromAnalysisId ? {} : { author: personRef(v.createdBy) }),
    });
  };

  // Fits: the stored runs, for their reports.
  const analysisIds = trace.panels.flatMap((p) => p.inputs.flatMap((i) => (i.kind === "analysis" ? [i.analysis.id] : [])));
  const runs = new Map(
    (analysisIds.length
      ? await getDb()
          .select()
          .from(analyses)
          .where(inArray(analyses.id, [...new Set(analysisIds)]))
      : []
    ).map((a) => [a.id, a]),
  );

  const specRefs: Array<{ "@id": string }> = [];
  const dataRefs = new Map<string, { "@id": string }>();
  for (const p of trace.panels) {
    if (!p.revision) continue;
    const rev = await getRevision(user, p.revision.id);
    const spec = await addFile(BUNDLE_PATHS.spec(p.letter), strToU8(canonicalJson(rev.spec)), "application/json", {
      name: `Vega-Lite spec of panel ${p.letter}, revision ${p.revision.number}`,
      conformsTo: ref("https://vega.github.io/schema/vega-lite/v6.json"),
    });
    const bindings = await addFile(
      `specs/panel-${p.letter}.bindings.json`,
      strToU8(JSON.stringify({ panel: p.letter, revision: p.revision, bound: rev.bound }, null, 2) + "\n"),
      "application/json",
      { name: `Data bound to panel ${p.letter}, revision ${p.revision.number}` },
    );
    specRefs.push(spec, bindings);
    const tables = await loadBoundTables(rev.bound);
    const bound: Parameters<typeof panelDataJson>[1] = {};
    const inputs = [];
    for (const input of p.inputs) {
      if (input.kind === "version") {
        const f = await versionFile(input.version);
        dataRefs.set(f["@id"], f);
        inputs.push(f);
        bound[input.name] = { described: { file: f["@id"] }, table: tables[input.name] };
        continue;
      }
      const a = input.analysis;
      const source = await versionFile(input.input);
      const out = await versionFile(input.derived);
      dataRefs.set(out["@id"], out);
      inputs.push(out);
      const base = `fits/${a.model}-${a.id}`;
      bound[input.name] = { described: { file: out["@id"], fit: `${base}.json`, output: input.output ?? null }, table: tables[input.name] };
      if (entities.has(`#fit-${a.id}`)) continue;
      const run = runs.get(a.id)!;
      const stored: StoredFit = { ...a, createdBy: a.createdBy, input: input.input, derived: input.derived, result: run.result };
      const reportJson = await addFile(`${base}.json`, strToU8(JSON.stringify(stored, null, 2) + "\n"), "application/json", {
        name: `Report of the ${a.model} fit (JSON)`,
      });
      const reportText = await addFile(`${base}.txt`, strToU8(fitReportText(stored)), "text/plain", { name: `Report of the ${a.model} fit` });
      const model = put({
        "@id": `#model-${a.model}-${a.modelVersion}`,
        "@type": "SoftwareApplication",
        name: `${a.model} fit model`,
        identifier: a.model,
        version: a.modelVersion,
        isPartOf: prooflight,
      });
      put({
        "@id": `#fit-${a.id}`,
        "@type": "CreateAction",
        name: `${a.model} fit of ${input.input.dataset}, version ${input.input.number}`,
        instrument: [model, prooflight],
        object: [source],
        result: [out, reportJson, reportText],
        agent: personRef(a.createdBy),
        endTime: iso(a.createdAt),
        description: `Options: ${JSON.stringify(a.options)}`,
      });
    }
    const data = panelDataJson({ panel: p.letter, revision: p.revision.number, contentHash: p.revision.contentHash }, bound);
    specRefs.push(
      await addFile(BUNDLE_PATHS.panelData(p.letter), data, "application/json", {
        name: `Rows drawn in panel ${p.letter}, revision ${p.revision.number}, full resolution`,
      }),
    );
    put({
      "@id": `#revision-${p.revision.id}`,
      "@type": "CreativeWork",
      name: `Panel ${p.letter}, revision ${p.revision.number}`,
      identifier: p.revision.contentHash,
      hasPart: [spec, bindings],
    });
    put({
      "@id": `#save-${p.revision.id}`,
      "@type": "CreateAction",
      name: `Panel ${p.letter}, revision ${p.revision.number} saved`,
      instrument: [prooflight],
      object: inputs,
      result: [spec, bindings],
      agent: personRef({ id: p.revision.createdBy, name: p.revision.createdByName }),
      endTime: iso(p.revision.createdAt),
      ...(p.revision.message ? { description: p.revision.message } : {}),
    });
  }

  // The figure drawn for the bundle; the PDF again with a fixed creation date so the bytes repeat.
  const signedOff = review.state === "signed_off";
  const status = signedOff ? "Signed off on this figure hash" : DRAFT_MARK_TEXT;
  const title = `Figure ${review.figure.number}: ${review.figure.title}`;
  const pdf = new Uint8Array(await svgToPdf(rendered.svg, { title, subject: `${status}; figure hash ${review.figureHash}`, creationDate: changedAt }));
  const png = (await printPng(rendered.svg, { dpi: 300, colour: "rgb", description: `${status}; figure hash ${review.figureHash}` })).bytes;
  const drawn: Array<[string, Uint8Array, string]> = [
    ["figure.svg", strToU8(rendered.svg), "image/svg+xml"],
    ["figure.pdf", pdf, "application/pdf"],
    ["figure.png", png, "image/png"],
  ];
  // How the figure was drawn, so it can be drawn again from this bundle alone.
  const style = await houseStyleOf(review.figure.manuscriptId);
  const renderRecord: BundleRender = {
    figureHash: review.figureHash,
    widthMm: review.figure.widthMm,
    columns: review.figure.columns,
    shareYTitles: review.figure.shareYTitles,
    houseStyle: style,
    panels: review.panels.map((p) => ({ letter: p.letter, span: p.panel.colSpan, spec: BUNDLE_PATHS.spec(p.letter), data: BUNDLE_PATHS.panelData(p.letter) })),
  };
  specRefs.push(
    await addFile(BUNDLE_PATHS.render, strToU8(JSON.stringify(renderRecord, null, 2) + "\n"), "application/json", {
      name: "How figure.svg was drawn: width, grid, house style, and each panel's spec and rows",
    }),
  );
  await addFile(BUNDLE_PATHS.parsed, strToU8(JSON.stringify(parsed, null, 2) + "\n"), "application/json", {
    name: "Each data file as the application parsed it: format, columns, row count, column statistics",
  });
  const renderedFiles: RenderedFile[] = drawn.map(([path, bytes, encodingFormat]) => ({
    path,
    sha256: sha256Hex(bytes),
    encodingFormat,
    byteSize: bytes.byteLength,
  }));
  const drawnRefs = [];
  for (const [path, bytes, type] of drawn) drawnRefs.push(await addFile(path, bytes, type, { name: `${title} (${path.split(".").pop()!.toUpperCase()})` }));
  const sourceRefs = [];
  for await (const { name, content } of sourceDataEntries(review)) {
    sourceRefs.push(await addFile(`source-data/${name}`, content, name.endsWith(".csv") ? "text/csv" : "text/plain"));
  }
  put({
    "@id": "#render",
    "@type": "CreateAction",
    name: `${title}, drawn for this bundle`,
    instrument: [prooflight, vega, vegaLite],
    object: [...specRefs, ...dataRefs.values()],
    result: [...drawnRefs, ...sourceRefs],
    agent: personRef(user),
  });
  putReviewActions(trace, review, put, personRef);

  const { exports: _leftOut, ...bundleTrace } = trace;
  await addFile("trace.json", strToU8(JSON.stringify(bundleTrace, null, 2) + "\n"), "application/json", {
    name: "Trace: raw file → analysis → revision → figure",
  });
  const prov = traceToProv(trace, { rendered: { files: renderedFiles, by: user } });
  await addFile("prov.json", strToU8(JSON.stringify(prov, null, 2) + "\n"), "application/json", {
    name: "Trace as W3C PROV-JSON",
    conformsTo: ref("https://www.w3.org/submissions/prov-json/"),
  });

  const fileIds = [...files].sort();
  const crate = {
    "@context": RO_CRATE_CONTEXT,
    "@graph": [
      { "@id": "ro-crate-metadata.json", "@type": "CreativeWork", conformsTo: ref(RO_CRATE_CONFORMS_TO), about: ref("./") },
      {
        "@id": "./",
        "@type": "Dataset",
        name: title,
        description: `Reproducibility bundle of Figure ${review.figure.number} (${review.figure.title}) at figure hash ${review.figureHash}: the raw and derived data by hash, the specs, fit reports, the drawn figure, its source data and its provenance.`,
        datePublished: iso(changedAt),
        identifier: review.figureHash,
        license: "Not stated by the application: ask the manuscript's PI how these files may be reused.",
        hasPart: fileIds.map(ref),
      },
      ...fileIds.map((id) => entities.get(id)!),
      ...[...entities.values()].filter((e) => e["@type"] !== "File"),
    ],
  };
  await zip.add("ro-crate-metadata.json", strToU8(JSON.stringify(crate, null, 2) + "\n"));
}
