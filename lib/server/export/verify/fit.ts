/** The fit check: every fit run again from its recorded model and options on the file it read. */
import "server-only";
import { storedParameters, type StoredParameter } from "@/lib/figures/fit-value";
import type { ParsedTable } from "@/lib/data/parse";
import { tableOfRows, tableRows } from "@/lib/data/table-rows";
import { fitColumns } from "../../analyses/fit-data";
import { curveFor, fitOrExplain } from "../../analyses/run-analysis";
import { SERIES } from "../../figures/bindings";
import { FIT_RELATIVE_TOLERANCE, TOL, type VerifyRow, type Json, type Entity, fitReport } from "./common";
import { firstRowDifference } from "./rows";

const refId = (v: unknown): string | undefined =>
  v && typeof v === "object" && typeof (v as Json)["@id"] === "string" ? ((v as Json)["@id"] as string) : undefined;
const refIds = (v: unknown): string[] => (Array.isArray(v) ? v : v ? [v] : []).map(refId).filter((x): x is string => Boolean(x));

/** |a − b| / max(|a|, |b|); 0 when both are 0; null on both sides counts as equal. */
function relativeDifference(a: number | null, b: number | null): number {
  if (a === null || b === null) return a === b ? 0 : Infinity;
  if (a === b) return 0;
  return Math.abs(a - b) / Math.max(Math.abs(a), Math.abs(b));
}

const nullIfNaN = (v: number) => (Number.isFinite(v) ? v : null);
const sci = (v: number) => (v === Infinity ? "∞" : v.toExponential(1));

export function fitRow(action: Entity, entities: Map<string, Entity>, files: Record<string, Uint8Array>, tables: Map<string, ParsedTable>): VerifyRow {
  const results = refIds(action.result);
  const reportPath = results.find((p) => p.startsWith("fits/") && p.endsWith(".json"));
  const derivedPath = results.find((p) => !p.startsWith("fits/"));
  const inputPath = refIds(action.object)[0];
  const item = `fit ${action["@id"].slice("#fit-".length)}${reportPath ? ` (${reportPath})` : ""}`;
  const fail = (detail: string): VerifyRow => ({ item, check: "fit", match: false, detail });
  if (!reportPath || !inputPath) return fail("the fit's CreateAction names no report or no input file");
  const report = fitReport(files, reportPath);
  if (typeof report === "string") return fail(report);
  const table = tables.get(inputPath);
  if (!table) return fail(`its input ${inputPath} was not parsed`);

  let refit: ReturnType<typeof fitOrExplain>;
  let data: ReturnType<typeof fitColumns>;
  try {
    data = fitColumns(table, report.options, 0);
    refit = fitOrExplain({ model: report.model, options: report.options }, data);
  } catch (err) {
    return fail(`could not be run again: ${(err as Error).message}`);
  }
  const diffs: string[] = [];
  const notes: string[] = [];
  if (refit.modelVersion !== report.modelVersion) diffs.push(`model version: recorded ${report.modelVersion}, this software ${refit.modelVersion}`);
  const recorded = new Map(storedParameters(report.result).map((p: StoredParameter) => [p.name, p]));
  let worst = 0;
  for (const p of refit.params) {
    const r = recorded.get(p.name);
    if (!r) {
      diffs.push(`${p.name}: not in the report`);
      continue;
    }
    recorded.delete(p.name);
    for (const [what, a, b] of [
      ["", r.value, nullIfNaN(p.value)],
      [" σ", r.stderr, nullIfNaN(p.stderr)],
    ] as const) {
      const d = relativeDifference(a, b);
      worst = Math.max(worst, d);
      if (d > FIT_RELATIVE_TOLERANCE) diffs.push(`${p.name}${what}: recorded ${a}, re-fitted ${b} (relative difference ${sci(d)} > ${TOL})`);
    }
    notes.push(`${p.name} = ${p.value}`);
  }
  for (const name of recorded.keys()) diffs.push(`${name}: in the report, not fitted`);

  // The derived file written by the fit: the points it was fitted to (exact) and the curve (to the tolerance).
  const derived = derivedPath ? tables.get(derivedPath) : undefined;
  if (derivedPath && derived) {
    const x = report.options.x;
    const y = report.options.y;
    const points = tableRows(derived, SERIES.data);
    const pointDiff = firstRowDifference(
      tableOfRows(points.map((r) => ({ x: r[x], y: r[y] }))),
      tableOfRows(Array.from(data.x, (v, i) => ({ x: nullIfNaN(v), y: nullIfNaN(data.y[i]) }))),
    );
    if (pointDiff) diffs.push(`fitted points in ${derivedPath} differ from ${inputPath}: ${pointDiff}`);
    const curve = tableRows(derived, SERIES.curve);
    const again = curveFor(report.model, refit, data.x);
    const scale = Math.max(...again.y.map((v) => Math.abs(v)).filter(Number.isFinite), 0) || 1;
    if (curve.length !== again.x.length) diffs.push(`fitted curve: recorded ${curve.length} points, re-fitted ${again.x.length}`);
    else
      for (let i = 0; i < curve.length; i++) {
        const dy = Math.abs((curve[i][y] as number) - again.y[i]) / scale;
        const dx = relativeDifference(curve[i][x] as number | null, nullIfNaN(again.x[i]));
        if (!(dy <= FIT_RELATIVE_TOLERANCE) || dx > FIT_RELATIVE_TOLERANCE) {
          diffs.push(`fitted curve point ${i + 1}: recorded (${curve[i][x]}, ${curve[i][y]}), re-fitted (${again.x[i]}, ${again.y[i]})`);
          break;
        }
      }
  } else if (derivedPath) diffs.push(`its derived file ${derivedPath} was not parsed`);

  const model = entities.get(refIds(action.instrument)[0] ?? "");
  const modelName = typeof model?.identifier === "string" ? model.identifier : report.model;
  if (diffs.length) return fail(diffs.join("; "));
  return {
    item,
    check: "fit",
    match: true,
    detail: `${modelName} ${report.modelVersion} on ${data.x.length} points of ${inputPath}: ${notes.join(", ")}; largest relative difference ${worst === 0 ? "0" : sci(worst)}`,
  };
}
