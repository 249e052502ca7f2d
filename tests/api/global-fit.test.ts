// Global fits through the API: the stacked fit of three uploaded T1 curves equals SciPy's, units
// come from the columns, the curves and residuals come back for plotting, and mismatched units or
// a parameter that is both fixed and shared are refused in words.
import { beforeAll, describe, expect, it } from "vitest";
import { DEMO_MANUSCRIPT_ID } from "@/lib/demo-data/accounts";
import * as upload from "@/app/api/manuscripts/[id]/datasets/route";
import * as global from "@/app/api/analyses/global/route";
import { call, setupTestApp, uploadForm, type Who } from "./harness";

let tokens: Record<Who, string>;
const versionIds: string[] = [];

/** Three T1 curves (ms) sharing S₀ = 0.7 and A = 0.3, with a hand-made wobble in place of noise. */
function t1Csv(k: number, t1: number, unit = "ms"): string {
  const rows = Array.from({ length: 30 }, (_, i) => {
    const t = 0.05 * 1.25 ** i;
    return `${t},${(0.7 + 0.3 * Math.exp(-t / t1) + 0.002 * Math.sin(7 * i + k)).toFixed(5)}`;
  });
  return `wait (${unit}),p\n${rows.join("\n")}\n`;
}

// SciPy 1.17.1, a stacked curve_fit of the same three curves with S0 and A shared (see
// tests/reference/fit/global-fit.test.ts for the script): S0, A, T1 of each curve, and their
// errors scaled by χ²ᵣ.
const SCIPY_VALUES = [0.7004107211442568, 0.29977166457220555, 1.9933856409743633, 3.9826582336700467, 7.974855264261967];
const SCIPY_STDERR = [0.0003811787874184697, 0.0004226352627112389, 0.011204827983785675, 0.02243500160345983, 0.04480026826958209];

async function put(name: string, csv: string): Promise<string> {
  const r = await call(upload.POST, {
    method: "POST",
    token: tokens.author,
    params: { id: DEMO_MANUSCRIPT_ID },
    rawBody: uploadForm(name, csv, { metadata: JSON.stringify({ kind: "relaxation" }) }),
  });
  expect(r.status).toBe(201);
  return r.json.id;
}

beforeAll(async () => {
  ({ tokens } = await setupTestApp());
  for (const [k, t1] of [2, 4, 8].entries()) versionIds.push(await put(`global-t1-${t1}ms.csv`, t1Csv(k, t1)));
});

const body = (ids: string[], extra: object = {}) => ({
  manuscriptId: DEMO_MANUSCRIPT_ID,
  versionIds: ids,
  model: "relaxation",
  shared: ["S0", "A"],
  options: { x: "wait", y: "p" },
  ...extra,
});

describe("POST /api/analyses/global", () => {
  it("fits the three curves at once with S₀ and A shared, as SciPy's stacked fit", async () => {
    const r = await call(global.POST, { method: "POST", token: tokens.author, body: body(versionIds) });
    expect(r.status).toBe(200);
    const fit = r.json;
    expect(fit.converged).toBe(true);
    expect(fit.params.map((p: { name: string; dataset: number | null }) => `${p.name}:${p.dataset}`)).toEqual(["S0:null", "A:null", "T1:0", "T1:1", "T1:2"]);
    fit.params.forEach((p: { value: number; stderr: number }, q: number) => {
      expect(Math.abs(p.value / SCIPY_VALUES[q] - 1)).toBeLessThan(1e-7);
      expect(Math.abs(p.stderr / SCIPY_STDERR[q] - 1)).toBeLessThan(1e-5);
    });
    expect(fit.params[2].unit).toBe("ms");
    expect(fit.dof).toBe(85);
    expect(fit.datasets).toHaveLength(3);
    expect(fit.datasets[1].label).toBe("global-t1-4ms.csv (version 1)");
    expect(fit.datasets[1].data.x).toHaveLength(30);
    expect(fit.datasets[1].curve.x.length).toBeGreaterThan(100);
    expect(fit.datasets[1].values.S0).toBe(fit.params[0].value);
  });

  it("refuses columns in different units, naming both versions", async () => {
    const inMicroseconds = await put("global-t1-us.csv", t1Csv(0, 2000, "µs"));
    const r = await call(global.POST, { method: "POST", token: tokens.author, body: body([versionIds[0], inMicroseconds]) });
    expect(r.status).toBe(400);
    expect(r.json.error.message).toMatch(/^versionIds: the x column is in ms in global-t1-2ms\.csv \(version 1\) but in µs in global-t1-us\.csv \(version 1\)/);
  });

  it("refuses a parameter both fixed and shared, and an unknown one", async () => {
    const fixedShared = await call(global.POST, {
      method: "POST",
      token: tokens.author,
      body: body(versionIds, { options: { x: "wait", y: "p", fixed: { A: 0.3 } } }),
    });
    expect(fixedShared.status).toBe(400);
    expect(fixedShared.json.error.message).toBe('shared: "A" is held fixed, so it cannot also be shared.');
    const unknown = await call(global.POST, { method: "POST", token: tokens.author, body: body(versionIds, { shared: ["T9"] }) });
    expect(unknown.status).toBe(400);
    expect(unknown.json.error.message).toBe('shared: unknown parameter "T9" for model relaxation.');
  });

  it("a viewer may not run it; an outsider learns nothing", async () => {
    expect((await call(global.POST, { method: "POST", token: tokens.viewer, body: body(versionIds) })).status).toBe(403);
    expect((await call(global.POST, { method: "POST", token: tokens.outsider, body: body(versionIds) })).status).toBe(404);
  });
});
