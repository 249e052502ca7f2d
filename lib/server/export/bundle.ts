import "server-only";
import fs from "node:fs/promises";
import { strToU8 } from "fflate";
import type { SessionUser } from "@/lib/authz";
import { sha256Hex } from "../crypto";
import { blobPath } from "../storage/blob-store";
import { traceFigure } from "../figures/trace";
import type { FigureReview } from "../review/review-context";
import { sourceDataFiles } from "./source-data";

type Trace = Awaited<ReturnType<typeof traceFigure>>;
interface VersionRef {
  versionId: string;
  sha256: string;
  fileName: string;
  byteSize: number;
  dataset: string;
  number: number;
}

/**
 * The reproducibility bundle as an RO-Crate (ro-crate-metadata.json, RO-Crate 1.1): the rendered
 * figure, every raw and derived file by hash, the specs, the source data and the trace, with each
 * analysis described as a CreateAction (W3C PROV-style: instrument = model, object = input, result = derived).
 */
export async function bundleFiles(user: SessionUser, review: FigureReview, rendered: { svg: string; pdf: Uint8Array }): Promise<Record<string, Uint8Array>> {
  const trace: Trace = await traceFigure(user, review.figure.id);
  const files: Record<string, Uint8Array> = {};
  const entities: Array<Record<string, unknown>> = [];
  const addFile = (path: string, bytes: Uint8Array, props: Record<string, unknown>) => {
    files[path] = bytes;
    entities.push({ "@id": path, "@type": "File", contentSize: String(bytes.byteLength), sha256: sha256Hex(bytes), ...props });
  };
  addFile("figure.svg", strToU8(rendered.svg), { name: `Figure ${review.figure.number}`, encodingFormat: "image/svg+xml" });
  addFile("figure.pdf", rendered.pdf, { name: `Figure ${review.figure.number} (PDF)`, encodingFormat: "application/pdf" });
  const seen = new Set<string>();
  const addVersion = async (v: VersionRef, folder: string) => {
    const path = `${folder}/${v.sha256.slice(0, 12)}-${v.fileName.replace(/[^\w.-]+/g, "_")}`;
    if (seen.has(path)) return path;
    seen.add(path);
    addFile(path, new Uint8Array(await fs.readFile(blobPath(v.sha256))), {
      name: `${v.dataset}, version ${v.number}`,
      encodingFormat: "text/plain",
      identifier: v.versionId,
    });
    return path;
  };
  for (const p of trace.panels) {
    if (!p.revision) continue;
    const specPath = `specs/panel-${p.letter}.vl.json`;
    addFile(specPath, strToU8(JSON.stringify({ revision: p.revision, inputs: p.inputs }, null, 2)), {
      name: `Panel ${p.letter} revision ${p.revision.number}`,
      encodingFormat: "application/json",
    });
    for (const input of p.inputs) {
      if (input.kind === "version") {
        await addVersion(input.version, "raw");
        continue;
      }
      const raw = await addVersion(input.input, "raw");
      const derived = await addVersion(input.derived, "derived");
      entities.push({
        "@id": `#analysis-${input.analysis.id}`,
        "@type": "CreateAction",
        name: `${input.analysis.model} fit`,
        instrument: { "@id": `#model-${input.analysis.model}` },
        object: [{ "@id": raw }],
        result: [{ "@id": derived }],
        startTime: new Date(input.analysis.createdAt).toISOString(),
        description: JSON.stringify(input.analysis.options),
      });
      entities.push({
        "@id": `#model-${input.analysis.model}`,
        "@type": "SoftwareApplication",
        name: `Prooflight model ${input.analysis.model}`,
        version: input.analysis.modelVersion,
      });
    }
  }
  for (const [name, bytes] of Object.entries(await sourceDataFiles(review)))
    addFile(`source-data/${name}`, bytes, { encodingFormat: name.endsWith(".csv") ? "text/csv" : "text/plain" });
  addFile("trace.json", strToU8(JSON.stringify(trace, null, 2)), { name: "Provenance trace", encodingFormat: "application/json" });
  const crate = {
    "@context": "https://w3id.org/ro/crate/1.1/context",
    "@graph": [
      { "@id": "ro-crate-metadata.json", "@type": "CreativeWork", conformsTo: { "@id": "https://w3id.org/ro/crate/1.1" }, about: { "@id": "./" } },
      {
        "@id": "./",
        "@type": "Dataset",
        name: `Figure ${review.figure.number}: ${review.figure.title}`,
        datePublished: new Date().toISOString(),
        identifier: review.figureHash,
        hasPart: entities.filter((e) => e["@type"] === "File").map((e) => ({ "@id": e["@id"] })),
      },
      ...entities,
    ],
  };
  files["ro-crate-metadata.json"] = strToU8(JSON.stringify(crate, null, 2));
  return files;
}
