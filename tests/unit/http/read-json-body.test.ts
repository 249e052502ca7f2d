import { describe, expect, it } from "vitest";
import { AppError } from "@/lib/errors";
import { checkJsonShape, describeLimit, readBodyBytes, readJsonBody } from "@/lib/http/read-json-body";

// A string body would otherwise be sent as text/plain, which JSON routes refuse (415).
const post = (body: BodyInit, headers: Record<string, string> = {}) =>
  new Request("http://localhost/api/x", { method: "POST", body, headers: { "content-type": "application/json", ...headers }, duplex: "half" } as RequestInit);

async function refusal(run: () => unknown): Promise<{ status: number; message: string }> {
  try {
    await run();
  } catch (e) {
    if (e instanceof AppError) return { status: e.status, message: e.message };
    throw e;
  }
  throw new Error("expected a refusal");
}

describe("readBodyBytes", () => {
  it("reads a body at the cap exactly and refuses one byte more", async () => {
    expect((await readBodyBytes(post(new Uint8Array(100)), 100)).byteLength).toBe(100);
    expect(await refusal(() => readBodyBytes(post(new Uint8Array(101)), 100))).toEqual({
      status: 413,
      message: "The request body is larger than the limit of 100 bytes.",
    });
  });

  it("stops pulling a stream once past the cap", async () => {
    let pulled = 0;
    let cancelled = false;
    const stream = new ReadableStream<Uint8Array>(
      {
        pull(c) {
          pulled++;
          c.enqueue(new Uint8Array(10));
        },
        cancel() {
          cancelled = true;
        },
      },
      { highWaterMark: 0 },
    );
    expect((await refusal(() => readBodyBytes(post(stream), 35))).status).toBe(413);
    expect(pulled).toBe(4);
    expect(cancelled).toBe(true);
  });

  it("trusts a Content-Length over the cap without reading", async () => {
    let pulled = 0;
    const stream = new ReadableStream<Uint8Array>(
      {
        pull(c) {
          pulled++;
          c.enqueue(new Uint8Array(1));
        },
      },
      { highWaterMark: 0 },
    );
    expect((await refusal(() => readBodyBytes(post(stream, { "content-length": "36" }), 35))).status).toBe(413);
    expect(pulled).toBe(0);
  });
});

describe("readJsonBody", () => {
  it("an empty body reads as {}", async () => {
    expect(await readJsonBody(new Request("http://localhost/api/x", { method: "POST" }), { maxBytes: 10 })).toEqual({});
    expect(await readJsonBody(post("  \n"), { maxBytes: 10 })).toEqual({});
  });

  it("refuses a body that says it is not JSON with 415, and accepts +json types", async () => {
    expect(await refusal(() => readJsonBody(post("{}", { "content-type": "text/plain;charset=UTF-8" })))).toEqual({
      status: 415,
      message: 'This route takes JSON: send Content-Type: application/json (the request said "text/plain").',
    });
    expect(await readJsonBody(post('{"a":1}', { "content-type": "application/merge-patch+json" }))).toEqual({ a: 1 });
  });

  it("names line and column of a syntax error", async () => {
    expect((await refusal(() => readJsonBody(post('{"a": 1,\n "b": tru}'), { maxBytes: 100 }))).message).toBe(
      'The request body is not valid JSON: line 2, column 7: unexpected "t" (expected a value).',
    );
  });
});

describe("checkJsonShape", () => {
  it("allows 64 levels and refuses 65, naming the path", () => {
    const nest = (n: number) => JSON.parse(`${"[".repeat(n)}${"]".repeat(n)}`);
    expect(() => checkJsonShape(nest(64))).not.toThrow();
    const r = (() => {
      try {
        checkJsonShape(nest(65));
      } catch (e) {
        return e as AppError;
      }
    })();
    expect(r?.status).toBe(400);
    expect(r?.message).toBe(`The request body nests objects and arrays more than 64 levels deep (at ${"[0]".repeat(64)}).`);
  });

  it("walks a 100,000-level value without recursion", () => {
    const deep = JSON.parse(`${'{"k":'.repeat(100_000)}0${"}".repeat(100_000)}`);
    expect(() => checkJsonShape(deep)).toThrow(/more than 64 levels deep/);
  });

  it("refuses __proto__ anywhere, however it is spelled in the text", () => {
    expect(() => checkJsonShape(JSON.parse('{"doc":{"content":[{"__proto__":{"x":1}}]}}'))).toThrow(
      'doc.content[0].__proto__: "__proto__" is not allowed as a key in the request body.',
    );
    expect(() => checkJsonShape(JSON.parse('{"a b":[{"\\u005f_proto__":null}]}'))).toThrow(
      '["a b"][0].__proto__: "__proto__" is not allowed as a key in the request body.',
    );
    expect(() => checkJsonShape(JSON.parse('{"constructor":{"prototype":{}}}'))).not.toThrow();
  });
});

describe("describeLimit", () => {
  it("uses binary units with the exact count", () => {
    expect(describeLimit(1024 * 1024)).toBe("1 MB (1,048,576 bytes)");
    expect(describeLimit(64 * 1024)).toBe("64 kB (65,536 bytes)");
    expect(describeLimit(1000)).toBe("1,000 bytes");
  });
});
