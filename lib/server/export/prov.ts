import "server-only";
import type { FigureTrace } from "../figures/trace";
import { SOFTWARE } from "./software";

/**
 * A figure's trace as W3C PROV, serialised as PROV-JSON ("The PROV-JSON Serialization", W3C Member
 * Submission, 24 April 2013, https://www.w3.org/submissions/prov-json/). Entities: stored files (named
 * by content hash as RFC 6920 "nih" names), dataset versions (uploaded and derived), specs, revisions,
 * the figure at its hash, exported files. Activities: uploads, parses, fits, revision saves, renders,
 * review decisions, sign-offs and their withdrawal. Agents: people and software (Prooflight, each fit
 * model at its version, the Vega renderer). Pure: the same trace gives the same document.
 */

type Literal = string | number | boolean | { $: string; type: string };
type Record_ = Record<string, Literal>;

export interface ProvDocument {
  prefix: Record<string, string>;
  entity: Record<string, Record_>;
  activity: Record<string, Record_>;
  agent: Record<string, Record_>;
  used: Record<string, Record_>;
  wasGeneratedBy: Record<string, Record_>;
  wasAssociatedWith: Record<string, Record_>;
  wasDerivedFrom: Record<string, Record_>;
  wasAttributedTo: Record<string, Record_>;
  wasInformedBy: Record<string, Record_>;
}

/** Files drawn for a bundle: path in the bundle, SHA-256 and media type. */
export interface RenderedFile {
  path: string;
  sha256: string;
  encodingFormat: string;
  byteSize: number;
}

export interface ProvOptions {
  /** The files a bundle drew from the figure, and who asked for them. */
  rendered?: { files: RenderedFile[]; by: { id: string; name: string } };
}

/** PROV-DM §5.7.2: a qualified name as an attribute value. */
const qn = (name: string) => ({ $: name, type: "prov:QUALIFIED_NAME" });
const iso = (d: Date | string) => new Date(d).toISOString();

const PROV_PREFIXES = {
  pl: "urn:prooflight:",
  nih: "nih:sha-256;",
} as const;

const provIds = {
  file: (sha256: string) => `nih:${sha256}`,
  version: (id: string) => `pl:version/${id}`,
  spec: (sha256: string) => `pl:spec/${sha256}`,
  revision: (id: string) => `pl:revision/${id}`,
  figure: (hash: string) => `pl:figure/${hash}`,
  exported: (seq: number) => `pl:export/${seq}`,
  person: (id: string) => `pl:person/${id}`,
  decision: (id: string) => `pl:decision/${id}`,
  signoff: (id: string) => `pl:signoff/${id}`,
};

export function traceToProv(trace: FigureTrace, options: ProvOptions = {}): ProvDocument {
  const doc: ProvDocument = {
    prefix: { ...PROV_PREFIXES },
    entity: {},
    activity: {},
    agent: {},
    used: {},
    wasGeneratedBy: {},
    wasAssociatedWith: {},
    wasDerivedFrom: {},
    wasAttributedTo: {},
    wasInformedBy: {},
  };
  const seen = new Set<string>();
  const counters: Record<string, number> = {};
  /** Adds a relation once; PROV-JSON names each relation record (here _:u1, _:g1 …). */
  const relate = (kind: Exclude<keyof ProvDocument, "prefix" | "entity" | "activity" | "agent">, tag: string, attrs: Record_) => {
    const key = `${kind}|${JSON.stringify(attrs)}`;
    if (seen.has(key)) return;
    seen.add(key);
    counters[tag] = (counters[tag] ?? 0) + 1;
    doc[kind][`_:${tag}${counters[tag]}`] = attrs;
  };
  const used = (activity: string, entity: string) => relate("used", "u", { "prov:activity": activity, "prov:entity": entity });
  const generated = (entity: string, activity: string) => relate("wasGeneratedBy", "g", { "prov:entity": entity, "prov:activity": activity });
  const associated = (activity: string, agent: string) => relate("wasAssociatedWith", "a", { "prov:activity": activity, "prov:agent": agent });
  const derived = (generatedEntity: string, usedEntity: string, activity?: string) =>
    relate("wasDerivedFrom", "d", {
      "prov:generatedEntity": generatedEntity,
      "prov:usedEntity": usedEntity,
      ...(activity ? { "prov:activity": activity } : {}),
    });
  const person = (p: { id: string; name: string }) => {
    const id = provIds.person(p.id);
    doc.agent[id] ??= { "prov:type": qn("prov:Person"), "prov:label": p.name };
    return id;
  };
  const software = (key: string, label: string, version: string) => {
    const id = `pl:software/${key}`;
    doc.agent[id] ??= { "prov:type": qn("prov:SoftwareAgent"), "prov:label": label, "pl:version": version };
    return id;
  };
  const prooflight = () => software("prooflight", `${SOFTWARE.prooflight.name} ${SOFTWARE.prooflight.version}`, SOFTWARE.prooflight.version);
  const renderer = () =>
    software(
      "vega",
      `${SOFTWARE.vega.name} ${SOFTWARE.vega.version} with ${SOFTWARE.vegaLite.name} ${SOFTWARE.vegaLite.version}`,
      `${SOFTWARE.vega.version}+${SOFTWARE.vegaLite.version}`,
    );
  const figureEntity = (hash: string) => {
    const id = provIds.figure(hash);
    doc.entity[id] ??= {
      "prov:type": qn("pl:Figure"),
      "prov:label": `Figure ${trace.figure.number} at hash ${hash.slice(0, 12)}${hash === trace.figure.figureHash ? "" : " (an earlier state)"}`,
      "pl:figureHash": hash,
    };
    return id;
  };

  type Version = Extract<FigureTrace["panels"][number]["inputs"][number], { kind: "version" }>["version"];
  /** A version and the file it was parsed from; an uploaded file also gets its upload. */
  const version = (v: Version) => {
    const id = provIds.version(v.versionId);
    if (doc.entity[id]) return id;
    const file = provIds.file(v.sha256);
    doc.entity[file] ??= { "prov:type": qn("pl:StoredFile"), "prov:label": v.fileName, "pl:sha256": v.sha256, "pl:byteSize": v.byteSize };
    doc.entity[id] = {
      "prov:type": qn(v.derivedFromAnalysisId ? "pl:DerivedVersion" : "pl:DatasetVersion"),
      "prov:label": `${v.dataset}, version ${v.number}`,
      "pl:number": v.number,
      "pl:sha256": v.sha256,
    };
    const parse = `pl:parse/${v.versionId}`;
    doc.activity[parse] = { "prov:type": qn("pl:Parse"), "prov:label": `Parse ${v.fileName} (${v.format})`, "prov:startTime": iso(v.createdAt) };
    used(parse, file);
    generated(id, parse);
    derived(id, file, parse);
    associated(parse, prooflight());
    if (!v.derivedFromAnalysisId) {
      const upload = `pl:upload/${v.versionId}`;
      doc.activity[upload] = { "prov:type": qn("pl:Upload"), "prov:label": `Upload ${v.fileName}`, "prov:startTime": iso(v.createdAt) };
      generated(file, upload);
      associated(upload, person(v.createdBy));
      relate("wasAttributedTo", "t", { "prov:entity": file, "prov:agent": person(v.createdBy) });
    }
    return id;
  };

  const figure = figureEntity(trace.figure.figureHash);
  doc.entity[figure]["pl:title"] = trace.figure.title;
  for (const p of trace.panels) {
    if (!p.revision) continue;
    const rev = provIds.revision(p.revision.id);
    const spec = provIds.spec(p.revision.specSha256);
    doc.entity[spec] ??= { "prov:type": qn("pl:Spec"), "prov:label": `Vega-Lite spec of panel ${p.letter}`, "pl:sha256": p.revision.specSha256 };
    doc.entity[rev] = {
      "prov:type": qn("pl:Revision"),
      "prov:label": `Panel ${p.letter}, revision ${p.revision.number}`,
      "pl:contentHash": p.revision.contentHash,
      ...(p.revision.message ? { "pl:message": p.revision.message } : {}),
    };
    const save = `pl:save/${p.revision.id}`;
    doc.activity[save] = {
      "prov:type": qn("pl:SaveRevision"),
      "prov:label": `Save panel ${p.letter}, revision ${p.revision.number}`,
      "prov:startTime": iso(p.revision.createdAt),
    };
    generated(rev, save);
    generated(spec, save);
    associated(save, person({ id: p.revision.createdBy, name: p.revision.createdByName }));
    derived(rev, spec, save);
    for (const input of p.inputs) {
      if (input.kind === "version") {
        const v = version(input.version);
        used(save, v);
        derived(rev, v, save);
        continue;
      }
      const a = input.analysis;
      const fit = `pl:fit/${a.id}`;
      const from = version(input.input);
      const out = version(input.derived);
      doc.activity[fit] ??= {
        "prov:type": qn("pl:Fit"),
        "prov:label": `${a.model} fit (model version ${a.modelVersion}) of ${input.input.dataset}, version ${input.input.number}`,
        "prov:startTime": iso(a.createdAt),
        "pl:options": JSON.stringify(a.options),
      };
      used(fit, from);
      generated(provIds.file(input.derived.sha256), fit);
      derived(out, from, fit);
      associated(fit, person(a.createdBy));
      associated(fit, software(`model/${a.model}/${a.modelVersion}`, `${a.model} fit model, version ${a.modelVersion}`, a.modelVersion));
      associated(fit, prooflight());
      used(save, out);
      derived(rev, out, save);
    }
    derived(figure, rev);
  }

  for (const d of trace.decisions) {
    const rev = provIds.revision(d.revisionId);
    doc.entity[rev] ??= {
      "prov:type": qn("pl:Revision"),
      "prov:label": `Panel ${d.panelLetter}, revision ${d.revisionNumber ?? "?"}`,
      "pl:contentHash": d.contentHash,
    };
    const act = provIds.decision(d.id);
    doc.activity[act] = {
      "prov:type": qn(d.decision === "approved" ? "pl:Approval" : "pl:NeedsRevision"),
      "prov:label": `Panel ${d.panelLetter}, revision ${d.revisionNumber ?? "?"}: ${d.decision === "approved" ? "approved" : "needs revision"}`,
      "prov:startTime": iso(d.createdAt),
      "pl:contentHash": d.contentHash,
      "pl:stale": d.stale,
      ...(d.note ? { "pl:note": d.note } : {}),
    };
    used(act, rev);
    associated(act, person(d.by));
  }
  for (const s of trace.signoffs) {
    const act = provIds.signoff(s.id);
    const fig = figureEntity(s.figureHash);
    doc.activity[act] = {
      "prov:type": qn("pl:SignOff"),
      "prov:label": `Figure ${trace.figure.number} signed off${s.withdrawn ? " (withdrawn)" : s.stale ? " (stale: the figure has changed since)" : ""}`,
      "prov:startTime": iso(s.createdAt),
      "pl:figureHash": s.figureHash,
      ...(s.reason ? { "pl:reason": s.reason } : {}),
    };
    used(act, fig);
    associated(act, person(s.by));
    if (s.withdrawn) {
      const w = `pl:withdrawal/${s.id}`;
      doc.activity[w] = {
        "prov:type": qn("pl:SignOffWithdrawal"),
        "prov:label": `Sign-off of Figure ${trace.figure.number} withdrawn`,
        "prov:startTime": iso(s.withdrawn.at),
        ...(s.withdrawn.reason ? { "pl:reason": s.withdrawn.reason } : {}),
      };
      relate("wasInformedBy", "i", { "prov:informed": w, "prov:informant": act });
      associated(w, person(s.withdrawn.by));
    }
  }
  for (const e of trace.exports) {
    const file = provIds.exported(e.seq);
    const render = `pl:render/export-${e.seq}`;
    const fig = figureEntity(e.figureHash);
    doc.entity[file] = {
      "prov:type": qn("pl:ExportedFile"),
      "prov:label": `Figure ${trace.figure.number} as ${e.format}${e.dpi ? ` at ${e.dpi} dpi` : ""}`,
      "pl:format": e.format,
      "pl:byteSize": e.bytes,
      "pl:draftMark": e.draftMark,
    };
    doc.activity[render] = { "prov:type": qn("pl:Render"), "prov:label": `Export Figure ${trace.figure.number} as ${e.format}`, "prov:startTime": iso(e.at) };
    used(render, fig);
    generated(file, render);
    derived(file, fig, render);
    associated(render, person(e.by));
    associated(render, prooflight());
    associated(render, renderer());
  }
  if (options.rendered) {
    const render = "pl:render/bundle";
    doc.activity[render] = { "prov:type": qn("pl:Render"), "prov:label": `Draw Figure ${trace.figure.number} for its bundle` };
    used(render, figure);
    associated(render, person(options.rendered.by));
    associated(render, prooflight());
    associated(render, renderer());
    for (const f of options.rendered.files) {
      const id = provIds.file(f.sha256);
      doc.entity[id] ??= {
        "prov:type": qn("pl:RenderedFile"),
        "prov:label": f.path,
        "pl:sha256": f.sha256,
        "pl:byteSize": f.byteSize,
        "pl:mediaType": f.encodingFormat,
      };
      generated(id, render);
      derived(id, figure, render);
    }
  }
  return doc;
}
