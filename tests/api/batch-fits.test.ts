// Batch fits on the fit pool (worker threads): the runs stored are the runs a one-at-a-time fit
// stores, the numbers agree with an independent SciPy fit, progress streams as NDJSON, and a
// stopped batch starts nothing more.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { analyses } from "@/db/schema";
import { DEMO_MANUSCRIPT_ID } from "@/lib/demo-data/accounts";
import * as upload from "@/app/api/manuscripts/[id]/datasets/route";
import * as single from "@/app/api/analyses/route";
import * as batch from "@/app/api/analyses/batch/route";
import { closeFitPool } from "@/lib/server/analyses/fit-pool";
import { runBatch, type BatchEvent } from "@/lib/server/analyses/batch";
import { resetEnvForTests } from "@/lib/env";
import { call, setupTestApp, uploadForm, type Who } from "./harness";

let tokens: Record<Who, string>;
const versionIds: string[] = [];
const AUTHOR = { id: "demo-author", email: "author@lab.example.org", name: "Tomás Ekberg" };

/** T1 curves with T1 = 2, 4 and 8 ms and a hand-made wobble in place of noise. */
function t1Csv(k: number, t1: number): string {
  const rows = Array.from({ length: 30 }, (_, i) => {
    const t = 0.05 * 1.25 ** i;
    return `${t},${(0.7 + 0.3 * Math.exp(-t / t1) + 0.002 * Math.sin(7 * i + k)).toFixed(5)}`;
  });
  return `wait (ms),p\n${rows.join("\n")}\n`;
}

// scipy.optimize.curve_fit(lambda t, s0, a, t1: s0 + a*np.exp(-t/t1), t, p, p0=[0.7, 0.3, T1],
// method="lm", ftol=xtol=gtol=1e-14) on the same three files (SciPy 1.17.1); T1 and √pcov[2,2]
// (curve_fit scales pcov by χ²ᵣ, as the stored standard errors are).
const SCIPY_T1: Array<[number, number]> = [
  [1.9934520508462126, 0.014233270546141215],
  [3.970267896640453, 0.02967161472965152],
  [7.989623917452775, 0.0755087592050166],
];

const body = (ids: string[]) => ({ manuscriptId: DEMO_MANUSCRIPT_ID, versionIds: ids, model: "relaxation", options: { x: "wait", y: "p" } });

beforeAll(async () => {
  process.env.FIT_WORKERS = "2";
  ({ tokens } = await setupTestApp());
  for (const [k, t1] of [2, 4, 8].entries()) {
    const r = await call(upload.POST, {
      method: "POST",
      token: tokens.author,
      params: { id: DEMO_MANUSCRIPT_ID },
      rawBody: uploadForm(`batch-t1-${t1}ms.csv`, t1Csv(k, t1), { metadata: JSON.stringify({ kind: "relaxation", tags: { group: "batch" } }) }),
    });
    expect(r.status).toBe(201);
    versionIds.push(r.json.id);
  }
});

afterAll(async () => {
  await closeFitPool();
  delete process.env.FIT_WORKERS;
});

function lines(text: string): BatchEvent[] {
  return text
    .trim()
    .split("\n")
    .map((l) => JSON.parse(l) as BatchEvent);
}

describe("POST /api/analyses/batch", () => {
  it("streams a start, one result per version and an end, and stores what a single run stores", async () => {
    const r = await call(batch.POST, { method: "POST", token: tokens.author, body: body(versionIds) });
    expect(r.status).toBe(200);
    expect(r.headers.get("content-type")).toMatch(/^application\/x-ndjson/);
    const events = lines(r.json as string);
    expect(events[0]).toEqual({ type: "start", total: 3, workers: 2 });
    expect(events.at(-1)).toEqual({ type: "end", done: 3, failed: 0, cancelled: 0 });
    const results = events.filter((e) => e.type === "result");
    expect(results.map((e) => e.versionId).sort()).toEqual([...versionIds].sort());

    for (const [i, versionId] of versionIds.entries()) {
      const event = results.find((e) => e.versionId === versionId)!;
      if (!event.ok) throw new Error(event.error);
      const t1 = event.run.parameters.find((p) => p.name === "T1")!;
      expect(t1.value! / SCIPY_T1[i][0] - 1).toBeCloseTo(0, 7);
      expect(t1.stderr! / SCIPY_T1[i][1] - 1).toBeCloseTo(0, 5);

      // The one-at-a-time path on the same version stores the same result.
      const alone = await call(single.POST, { method: "POST", token: tokens.author, body: { versionId, model: "relaxation", options: { x: "wait", y: "p" } } });
      const [stored] = await getDb().select().from(analyses).where(eq(analyses.id, event.run.id));
      const [storedAlone] = await getDb().select().from(analyses).where(eq(analyses.id, alone.json.id));
      expect(stored.result).toEqual(storedAlone.result);
      expect(stored.inputSha256).toBe(storedAlone.inputSha256);
    }
  });

  it("a fit the data refuse fails in its own row; the others are stored", async () => {
    const r = await call(batch.POST, {
      method: "POST",
      token: tokens.author,
      body: { ...body(versionIds.slice(0, 2)), options: { x: "wait", y: "p", fixed: { T9: 1 } } },
    });
    const events = lines(r.json as string);
    expect(events.at(-1)).toEqual({ type: "end", done: 2, failed: 2, cancelled: 0 });
    for (const e of events.filter((x) => x.type === "result")) {
      expect(e.ok).toBe(false);
      if (!e.ok) expect(e.error).toMatch(/^options\.fixed: /);
    }
  });

  it("stopping after the first result starts no further fit", async () => {
    process.env.FIT_WORKERS = "1";
    resetEnvForTests();
    const stop = new AbortController();
    const seen: BatchEvent[] = [];
    const before = (await getDb().select().from(analyses)).length;
    for await (const event of runBatch(AUTHOR, body(versionIds), stop.signal)) {
      seen.push(event);
      if (event.type === "result") stop.abort();
    }
    process.env.FIT_WORKERS = "2";
    resetEnvForTests();
    expect(seen.map((e) => e.type)).toEqual(["start", "result", "end"]);
    expect(seen.at(-1)).toEqual({ type: "end", done: 1, failed: 0, cancelled: 2 });
    expect((await getDb().select().from(analyses)).length).toBe(before + 1);
  });
});
