import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { resetEnvForTests } from "@/lib/env";
import { sweepUploadTemp } from "@/lib/server/storage/blob-store";

let dir: string;
const saved = process.env.UPLOADS_DIR;
beforeAll(() => {
  dir = fs.mkdtempSync(path.join(os.tmpdir(), "prooflight-sweep-"));
  process.env.UPLOADS_DIR = path.join(dir, "uploads");
  resetEnvForTests();
});
afterAll(() => {
  if (saved === undefined) delete process.env.UPLOADS_DIR;
  else process.env.UPLOADS_DIR = saved;
  resetEnvForTests();
  fs.rmSync(dir, { recursive: true, force: true });
});

function put(rel: string, ageMs: number, now: number, bytes = 10) {
  const file = path.join(dir, "uploads", rel);
  fs.mkdirSync(path.dirname(file), { recursive: true });
  fs.writeFileSync(file, "x".repeat(bytes));
  const t = new Date(now - ageMs);
  fs.utimesSync(file, t, t);
}

describe("sweepUploadTemp", () => {
  it("answers nothing when there is no temporary folder yet", async () => {
    expect(await sweepUploadTemp(60_000)).toEqual({ removed: [], bytes: 0 });
  });

  it("removes only .part files in uploads/tmp older than the grace period, and logs what it removed", async () => {
    const info = vi.spyOn(console, "info").mockImplementation(() => undefined);
    const now = Date.now();
    put("tmp/old-1.part", 10 * 60_000, now, 100);
    put("tmp/old-2.part", 3 * 60_000, now, 20);
    put("tmp/fresh.part", 1_000, now);
    put("tmp/notes.txt", 10 * 60_000, now);
    put("ab/cd/old-blob.part", 10 * 60_000, now);
    fs.mkdirSync(path.join(dir, "uploads", "tmp", "dir.part"));

    expect(await sweepUploadTemp(2 * 60_000, now)).toEqual({ removed: ["old-1.part", "old-2.part"], bytes: 120 });
    expect(fs.readdirSync(path.join(dir, "uploads", "tmp")).sort()).toEqual(["dir.part", "fresh.part", "notes.txt"]);
    expect(fs.existsSync(path.join(dir, "uploads", "ab", "cd", "old-blob.part"))).toBe(true);
    expect(info.mock.calls).toEqual([["[prooflight] removed 2 abandoned upload part files (120 bytes) from uploads/tmp"]]);

    info.mockClear();
    expect(await sweepUploadTemp(2 * 60_000, now)).toEqual({ removed: [], bytes: 0 });
    expect(info).not.toHaveBeenCalled();
    info.mockRestore();
  });
});
