// Bootstrap intervals through the API: the streamed preview reports progress and ends with the run,
// saving with the same options stores the same intervals (seeded draws) in the run and in its
// derived file, and closing the stream stops the draws.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { analyses, versions } from "@/db/schema";
import { DEMO_MANUSCRIPT_ID } from "@/lib/demo-data/accounts";
import * as upload from "@/app/api/manuscripts/[id]/datasets/route";
import * as single from "@/app/api/analyses/route";
import * as bootstrap from "@/app/api/analyses/bootstrap/route";
import * as raw from "@/app/api/versions/[id]/raw/route";
import { closeFitPool } from "@/lib/server/analyses/fit-pool";
import { previewWithBootstrap, type BootstrapEvent } from "@/lib/server/analyses/bootstrap-preview";
import { call, setupTestApp, uploadForm, type Who } from "./harness";

let tokens: Record<Who, string>;
let versionId = "";
const AUTHOR = { id: "demo-author", email: "author@lab.example.org", name: "Tomás Ekberg" };

/** A T1 curve (T1 = 4 ms) with a hand-made wobble in place of noise. */
const CSV = `wait (ms),p\n${Array.from({ length: 30 }, (_, i) => {
  const t = 0.05 * 1.25 ** i;
  return `${t},${(0.7 + 0.3 * Math.exp(-t / 4) + 0.002 * Math.sin(7 * i + 1)).toFixed(5)}`;
}).join("\n")}\n`;

// scipy.optimize.curve_fit(lambda t, s0, a, t1: s0 + a*np.exp(-t/t1), t, p, p0=[0.7, 0.3, 4],
// method="lm") on the same file (SciPy 1.17.1): T1 and √pcov[2,2], scaled by χ²ᵣ.
const SCIPY_T1 = [3.970267896640453, 0.02967161472965152];

const options = { x: "wait", y: "p", bootstrap: { draws: 400, seed: 5 } };

beforeAll(async () => {
  ({ tokens } = await setupTestApp());
  const r = await call(upload.POST, {
    method: "POST",
    token: tokens.author,
    params: { id: DEMO_MANUSCRIPT_ID },
    rawBody: uploadForm("bootstrap-t1.csv", CSV, { metadata: JSON.stringify({ kind: "relaxation" }) }),
  });
  expect(r.status).toBe(201);
  versionId = r.json.id;
});

afterAll(() => closeFitPool());

const events = (text: string) =>
  text
    .trim()
    .split("\n")
    .map((l) => JSON.parse(l) as BootstrapEvent);

describe("POST /api/analyses/bootstrap", () => {
  it("streams progress to the end, then the run with intervals that the stored run repeats", async () => {
    const r = await call(bootstrap.POST, { method: "POST", token: tokens.author, body: { versionId, model: "relaxation", options } });
    expect(r.status).toBe(200);
    expect(r.headers.get("content-type")).toMatch(/^application\/x-ndjson/);
    const seen = events(r.json as string);
    const progress = seen.filter((e) => e.type === "progress").map((e) => (e.type === "progress" ? e.done : -1));
    expect(progress[0]).toBe(0);
    expect(progress.at(-1)).toBe(400);
    expect(progress).toEqual([...progress].sort((a, b) => a - b));
    const done = seen.at(-1)!;
    if (done.type !== "done") throw new Error(`last event was ${done.type}`);
    const t1 = done.run.bootstrap!.parameters.find((p) => p.name === "T1")!;
    // The fit itself is SciPy's; the bootstrap's ±1σ-equivalent half-width is close to its error.
    expect(t1.value! / SCIPY_T1[0] - 1).toBeCloseTo(0, 6);
    const halfWidth = (t1.interval68[1]! - t1.interval68[0]!) / 2;
    expect(halfWidth / SCIPY_T1[1]).toBeGreaterThan(0.75);
    expect(halfWidth / SCIPY_T1[1]).toBeLessThan(1.33);
    expect(t1.unit).toBe("ms");
    expect(done.run.bootstrap!.used).toBe(400);

    const saved = await call(single.POST, { method: "POST", token: tokens.author, body: { versionId, model: "relaxation", options } });
    expect(saved.status).toBe(201);
    const [stored] = await getDb().select().from(analyses).where(eq(analyses.id, saved.json.id));
    expect((stored.result as { bootstrap: unknown }).bootstrap).toEqual(done.run.bootstrap);
    expect(stored.options).toEqual(options);

    const [derived] = await getDb().select().from(versions).where(eq(versions.id, saved.json.derivedVersionId));
    const file = await call(raw.GET, { token: tokens.author, params: { id: derived.id } });
    const text = file.json as string;
    expect(text).toContain("# bootstrap: residual resampling, 400 draws (seed 5), 400 refits converged; percentile intervals, central 68.27 % and 95 %");
    expect(text).toContain(`# bootstrap T1: 68 % [${t1.interval68[0]}, ${t1.interval68[1]}], 95 % [${t1.interval95[0]}, ${t1.interval95[1]}] ms`);
  });

  it("a viewer may not run it; an outsider learns nothing", async () => {
    const body = { versionId, model: "relaxation", options };
    expect((await call(bootstrap.POST, { method: "POST", token: tokens.viewer, body })).status).toBe(403);
    expect((await call(bootstrap.POST, { method: "POST", token: tokens.outsider, body })).status).toBe(404);
  });

  it("stopping after the first chunk draws no more", async () => {
    const stop = new AbortController();
    const seen: BootstrapEvent[] = [];
    for await (const event of previewWithBootstrap(
      AUTHOR,
      { versionId, model: "relaxation", options: { ...options, bootstrap: { draws: 1000, seed: 5 } } },
      stop.signal,
    )) {
      seen.push(event);
      if (event.type === "progress" && event.done > 0) stop.abort();
    }
    expect(seen.map((e) => e.type)).toEqual(["progress", "progress", "cancelled"]);
    expect(seen.at(-1)).toEqual({ type: "cancelled", done: 25, total: 1000 });
  });
});
