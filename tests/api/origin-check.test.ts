import { beforeAll, describe, expect, it, vi } from "vitest";
import { DEMO_MANUSCRIPT_ID } from "@/lib/demo-data/accounts";
import { AppError } from "@/lib/errors";
import { checkOrigin } from "@/lib/http/route";
import * as figuresRoute from "@/app/api/figures/route";
import * as figure from "@/app/api/figures/[id]/route";
import { call, setupTestApp, type Who } from "./harness";

// A request carrying a session cookie is the demo author (see cookie-caller.ts).
vi.mock("@/lib/http/request-user", () => import("./cookie-caller").then((m) => m.cookieCallerModule()));

let tokens: Record<Who, string>;
let figureId: string;
beforeAll(async () => {
  ({ tokens } = await setupTestApp());
  figureId = (await call(figuresRoute.POST, { method: "POST", token: tokens.author, body: { manuscriptId: DEMO_MANUSCRIPT_ID, title: "Origins" } })).json.id;
});

const patchWithCookie = (headers: Record<string, string>) =>
  call(figure.PATCH, { method: "PATCH", params: { id: figureId }, body: { title: "Renamed" }, headers: { cookie: "authjs.session-token=x", ...headers } });

describe("cookie-authenticated writes and the Origin header", () => {
  it.each([["null"], ["not a url"], ["http://[::1"], ["file:///etc/passwd"], ["https://evil.example"]])("Origin %s is a 403, not a 500", async (origin) => {
    const r = await patchWithCookie({ origin });
    expect(r.status).toBe(403);
    expect(r.json.error).toEqual({ code: "forbidden", message: "Cross-site request refused." });
  });

  it("our own origin passes", async () => {
    const r = await patchWithCookie({ origin: "http://localhost:3000" });
    expect(r.status).toBe(200);
    expect(r.json.title).toBe("Renamed");
  });

  it("without an Origin, Sec-Fetch-Site decides", async () => {
    expect((await patchWithCookie({ "sec-fetch-site": "cross-site" })).status).toBe(403);
    expect((await patchWithCookie({})).json.error.message).toBe(
      "Requests signed in with a cookie must carry an Origin header; scripts should use an API token.",
    );
  });
});

describe("checkOrigin", () => {
  const req = (headers: Record<string, string>) => new Request("http://localhost:3000/api/x", { method: "POST", headers });

  it("refuses a null or malformed Origin with a 403 AppError", () => {
    for (const origin of ["null", "::", "http://"]) {
      let thrown: unknown;
      try {
        checkOrigin(req({ origin }));
      } catch (e) {
        thrown = e;
      }
      expect(thrown).toBeInstanceOf(AppError);
      expect((thrown as AppError).status).toBe(403);
    }
  });

  it("accepts the Host header's origin", () => {
    expect(() => checkOrigin(req({ origin: "https://prooflight.example", host: "prooflight.example" }))).not.toThrow();
  });
});
