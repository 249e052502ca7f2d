// Model comparison through the API: an uploaded echo fitted with n free, n = 1 and n = 2 gives
// SciPy's χ², AIC and BIC for each (model-comparison.py beside tests/reference/fit/model-comparison.test.ts,
// SciPy 1.17.1), the F-tests of the nested pairs, residuals and curves for the strips, units from
// the columns; bad candidates are refused in words and nothing is stored.
import { beforeAll, describe, expect, it } from "vitest";
import { DEMO_MANUSCRIPT_ID } from "@/lib/demo-data/accounts";
import * as upload from "@/app/api/manuscripts/[id]/datasets/route";
import * as compare from "@/app/api/analyses/compare/route";
import * as versionRuns from "@/app/api/versions/[id]/analyses/route";
import { call, setupTestApp, uploadForm, type Who } from "./harness";

let tokens: Record<Who, string>;
let versionId: string;

/** The echo of the reference test: n = 2, T2 = 60 µs, a hand-made wobble in place of noise, 80 points. */
const echoCsv = () =>
  `tau (µs),signal\n${Array.from({ length: 80 }, (_, i) => {
    const t = 2 + 4 * i;
    return `${t},${0.5 + 0.3 * Math.exp(-((t / 60) ** 2)) + 0.004 * Math.sin(5 * i)}`;
  }).join("\n")}\n`;

// [χ², AIC, BIC] of each candidate from SciPy (curve_fit, method "lm"), and the F-tests' p.
const SCIPY: Record<string, number[]> = {
  "n free": [0.00063301558945269, -931.7633714327917, -922.2352648940962],
  "n = 1": [0.021144217740508675, -653.0732350740903, -645.9271551700687],
  "n = 2": [0.0006340886978443737, -933.6278676818849, -926.4817877778632],
};

const candidates = [
  { label: "n free", model: "hahn_echo" },
  { label: "n = 1", model: "hahn_echo", fixed: { n: 1 } },
  { label: "n = 2", model: "hahn_echo", fixed: { n: 2 } },
];

beforeAll(async () => {
  ({ tokens } = await setupTestApp());
  const r = await call(upload.POST, {
    method: "POST",
    token: tokens.author,
    params: { id: DEMO_MANUSCRIPT_ID },
    rawBody: uploadForm("compare-echo.csv", echoCsv(), { metadata: JSON.stringify({ kind: "hahn_echo" }) }),
  });
  expect(r.status).toBe(201);
  versionId = r.json.id;
});

describe("POST /api/analyses/compare", () => {
  it("ranks n free, n = 1 and n = 2 as SciPy's fits do and prefers n = 2", async () => {
    const r = await call(compare.POST, { method: "POST", token: tokens.author, body: { versionId, options: { x: "tau", y: "signal" }, candidates } });
    expect(r.status).toBe(200);
    const result = r.json;
    expect(result.points).toBe(80);
    expect(result.weighted).toBe(false);
    expect(result.units).toEqual({ x: "µs", y: null });
    expect(result.preferred).toBe("n = 2");
    expect(result.reason).toMatch(/^n = 2: lowest AIC, 1\.9 below n free/);
    for (const c of result.candidates) {
      const [chi2, aic, bic] = SCIPY[c.label];
      expect(Math.abs(c.chi2 / chi2 - 1), `χ² of ${c.label}`).toBeLessThan(1e-7);
      expect(Math.abs(c.aic - aic), `AIC of ${c.label}`).toBeLessThan(1e-6);
      expect(Math.abs(c.bic - bic), `BIC of ${c.label}`).toBeLessThan(1e-6);
      expect(c.residuals).toHaveLength(80);
      expect(c.curve.x.length).toBeGreaterThan(100);
    }
    const free = result.candidates.find((c: { label: string }) => c.label === "n free");
    expect(free.k).toBe(4);
    expect(free.parameters.find((p: { name: string }) => p.name === "T2").unit).toBe("µs");
    const held = result.candidates.find((c: { label: string }) => c.label === "n = 1");
    expect(held.parameters.find((p: { name: string }) => p.name === "n")).toMatchObject({ value: 1, fixed: true });
    expect(held.deltaAic).toBeCloseTo(-653.0732350740903 + 933.6278676818849, 5);
    const tests = Object.fromEntries(result.tests.map((t: { simpler: string; fuller: string }) => [`${t.simpler} ⊂ ${t.fuller}`, t]));
    expect(Object.keys(tests).sort()).toEqual(["n = 1 ⊂ n free", "n = 2 ⊂ n free"]);
    expect(Math.abs(tests["n = 2 ⊂ n free"].p - 0.7206355323400181)).toBeLessThan(1e-5);
    expect(tests["n = 1 ⊂ n free"].rejectsSimpler).toBe(true);
    expect(result.data.x).toHaveLength(80);
  });

  it("fits only the window when one is given", async () => {
    const r = await call(compare.POST, {
      method: "POST",
      token: tokens.author,
      body: { versionId, options: { x: "tau", y: "signal", xRange: [0, 150] }, candidates: candidates.slice(0, 2) },
    });
    expect(r.status).toBe(200);
    // τ = 2, 6, …, 150: 38 points.
    expect(r.json.points).toBe(38);
    expect(r.json.candidates[0].residuals).toHaveLength(38);
  });

  it("names the candidate whose parameters are wrong, and stores nothing", async () => {
    const r = await call(compare.POST, {
      method: "POST",
      token: tokens.author,
      body: { versionId, options: { x: "tau", y: "signal" }, candidates: [candidates[0], { label: "odd", model: "hahn_echo", fixed: { T9: 1 } }] },
    });
    expect(r.status).toBe(400);
    expect(r.json.error.message).toMatch(/^candidates: candidate 2 \(odd\): .*T9/);
    const runs = await call(versionRuns.GET, { token: tokens.author, params: { id: versionId } });
    expect(runs.json.items).toEqual([]);
  });

  it("is refused to a reviewer, and is not there for an outsider", async () => {
    const body = { versionId, options: { x: "tau", y: "signal" }, candidates };
    expect((await call(compare.POST, { method: "POST", token: tokens.reviewer, body })).status).toBe(403);
    expect((await call(compare.POST, { method: "POST", token: tokens.outsider, body })).status).toBe(404);
  });
});
