import { gunzipSync } from "node:zlib";
import { describe, expect, it } from "vitest";
import { acceptsGzip, jsonAnswer } from "@/lib/http/json-answer";

const req = (acceptEncoding?: string) =>
  new Request("http://localhost/api/x", { headers: acceptEncoding === undefined ? {} : { "accept-encoding": acceptEncoding } });

/** 40 figures with a 30-character title each: about 2.4 KB of JSON, over the 1 KB threshold. */
const big = { figures: Array.from({ length: 40 }, (_, i) => ({ number: i + 1, title: "Spin-echo decay of the ensemble" })) };
const small = { ok: true };

// Accept-Encoding grammar and q-values from RFC 9110 §12.5.3 and §12.4.2 (q=0 means "not acceptable").
describe("Accept-Encoding: gzip", () => {
  it.each([
    ["gzip", true],
    ["gzip, deflate, br", true],
    ["br;q=1.0, gzip;q=0.8, *;q=0.1", true],
    ["*", true],
    ["gzip;q=0", false],
    ["identity", false],
    ["br", false],
    ["deflate", false],
    ["*;q=0, identity", false],
    ["", false],
  ])("%j → %s", (header, expected) => {
    expect(acceptsGzip(req(header))).toBe(expected);
  });

  it("no header takes no encoding", () => {
    expect(acceptsGzip(req())).toBe(false);
  });
});

describe("jsonAnswer", () => {
  it("compresses an answer of 1 KB or more for a client that takes gzip, once", async () => {
    const res = jsonAnswer(req("gzip, deflate"), big);
    expect(res.headers.get("content-encoding")).toBe("gzip");
    expect(res.headers.get("content-type")).toBe("application/json");
    expect(res.headers.get("vary")).toBe("Accept-Encoding");
    const bytes = Buffer.from(await res.arrayBuffer());
    expect(bytes.length).toBeLessThan(1024);
    const decoded = JSON.parse(gunzipSync(bytes).toString("utf8"));
    expect(decoded.figures).toHaveLength(40);
    expect(decoded.figures[39]).toEqual({ number: 40, title: "Spin-echo decay of the ensemble" });
  });

  it("sends the same answer uncompressed to a client that does not take gzip", async () => {
    const res = jsonAnswer(req("br"), big);
    expect(res.headers.get("content-encoding")).toBeNull();
    expect(res.headers.get("vary")).toBe("Accept-Encoding");
    expect(await res.json()).toEqual(big);
  });

  it("leaves a small answer as it is", async () => {
    const res = jsonAnswer(req("gzip"), small);
    expect(res.headers.get("content-encoding")).toBeNull();
    expect(res.headers.get("vary")).toBeNull();
    expect(await res.text()).toBe('{"ok":true}');
  });

  it("keeps the status and the headers it is given", async () => {
    const res = jsonAnswer(req("gzip"), big, { status: 201, headers: { Vary: "Prefer", "Preference-Applied": "return=minimal" } });
    expect(res.status).toBe(201);
    expect(res.headers.get("vary")).toBe("Prefer, Accept-Encoding");
    expect(res.headers.get("preference-applied")).toBe("return=minimal");
    expect(res.headers.get("content-encoding")).toBe("gzip");
  });
});
