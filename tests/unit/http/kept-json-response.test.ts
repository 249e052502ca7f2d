import { gunzipSync } from "node:zlib";
import { describe, expect, it } from "vitest";
import { keptJsonResponse } from "@/lib/http/kept-json-response";
import { KeptJson } from "@/lib/server/kept-json";

const LONG = JSON.stringify({ items: Array.from({ length: 80 }, (_, i) => ({ id: `item-${i}`, state: "in_review" })) });
const get = (acceptEncoding?: string) =>
  new Request("http://localhost/api/x", { headers: acceptEncoding === undefined ? {} : { "accept-encoding": acceptEncoding } });

// Accept-Encoding grammar and q-values: RFC 9110 §12.5.3; an absent header leaves the answer as it is.
describe("a kept JSON answer goes out compressed only when the client accepts gzip", () => {
  it.each([
    ["gzip, deflate", "gzip"],
    ["br;q=1.0, gzip;q=0.8", "gzip"],
    ["*", "gzip"],
    ["gzip;q=0", null],
    ["br", null],
    ["identity", null],
    [undefined, null],
  ])("Accept-Encoding %j → %s", async (header, encoding) => {
    const res = keptJsonResponse(get(header), new KeptJson(LONG));
    expect(res.headers.get("content-encoding")).toBe(encoding);
    expect(res.headers.get("content-type")).toBe("application/json");
    expect(res.headers.get("vary")).toBe("Accept-Encoding");
    const bytes = Buffer.from(await res.arrayBuffer());
    expect((encoding ? gunzipSync(bytes) : bytes).toString("utf8")).toBe(LONG);
  });

  it("an answer under 1 KB is sent as it is", async () => {
    const res = keptJsonResponse(get("gzip"), new KeptJson('{"id":"m1"}'));
    expect(res.headers.get("content-encoding")).toBeNull();
    expect(await res.text()).toBe('{"id":"m1"}');
  });

  it("compresses once, however often it is sent", () => {
    const kept = new KeptJson(LONG);
    expect(kept.gzip).toBe(kept.gzip);
  });
});
