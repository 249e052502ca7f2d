import "server-only";
import { formatDate, formatNumber, formatValueError } from "@/lib/data/format";
import type { FigureTrace } from "../figures/trace";

type AnalysisInput = Extract<FigureTrace["panels"][number]["inputs"][number], { kind: "analysis" }>;

/** A stored fit as the bundle reports it: the run as recorded, what it read and what it wrote. */
export interface StoredFit {
  id: string;
  model: string;
  modelVersion: string;
  options: Record<string, unknown>;
  inputSha256: string;
  createdAt: Date | string;
  createdBy: { id: string; name: string };
  input: AnalysisInput["input"];
  derived: AnalysisInput["derived"];
  result: Record<string, unknown>;
}

interface Quantity {
  name: string;
  value: number | null;
  stderr: number | null;
  unit?: string | null;
  fixed?: boolean;
  atBound?: boolean;
  description?: string;
}

const num = (v: unknown) => (typeof v === "number" ? v : null);
const unit = (u: string | null | undefined) => (u ? ` ${u}` : "");

/** The fit report in words: model and version, input by hash, fitted and derived values ± standard errors, goodness of fit. */
export function fitReportText(f: StoredFit): string {
  const r = f.result;
  const params = (Array.isArray(r.parameters) ? r.parameters : []) as Quantity[];
  const derived = (Array.isArray(r.derived) ? r.derived : []) as Quantity[];
  const lines = [
    `Fit ${f.id}`,
    `Model: ${f.model}, version ${f.modelVersion}`,
    `Run by ${f.createdBy.name} on ${formatDate(f.createdAt)}`,
    `Input: ${f.input.dataset}, version ${f.input.number} (${f.input.fileName}), sha256 ${f.inputSha256}`,
    `Output: ${f.derived.dataset}, version ${f.derived.number} (${f.derived.fileName}), sha256 ${f.derived.sha256}`,
    `Options: ${JSON.stringify(f.options)}`,
    "",
    "Fitted parameters (value ± standard error):",
    ...params.map((p) => `  ${p.name} = ${formatValueError(p.value, p.stderr)}${unit(p.unit)}${p.fixed ? " (fixed)" : ""}${p.atBound ? " (at a bound)" : ""}`),
  ];
  if (derived.length)
    lines.push(
      "",
      "Derived quantities:",
      ...derived.map((d) => `  ${d.name} = ${formatValueError(d.value, d.stderr)}${unit(d.unit)}${d.description ? ` — ${d.description}` : ""}`),
    );
  lines.push(
    "",
    `Points: ${num(r.points) ?? "—"}; degrees of freedom: ${num(r.dof) ?? "—"}`,
    `χ² = ${formatNumber(num(r.chi2))}; reduced χ² = ${formatNumber(num(r.chi2red))}; R² = ${formatNumber(num(r.r2))}`,
    `Converged: ${r.converged === true ? "yes" : "no"}${typeof r.reason === "string" && r.reason ? ` (${r.reason})` : ""}`,
  );
  const quality = r.quality as { level?: unknown; summary?: unknown; findings?: Array<{ message?: unknown }> } | undefined;
  lines.push(
    quality && typeof quality.summary === "string"
      ? `Quality: ${String(quality.level)} — ${quality.summary}`
      : "Quality: not judged (a run stored before fits were judged)",
  );
  for (const f of Array.isArray(quality?.findings) ? quality.findings : []) if (typeof f?.message === "string") lines.push(`  ${f.message}`);
  const warnings = Array.isArray(r.warnings) ? (r.warnings as unknown[]).map(String) : [];
  if (warnings.length) lines.push("", "Warnings:", ...warnings.map((w) => `  ${w}`));
  return lines.join("\n") + "\n";
}
