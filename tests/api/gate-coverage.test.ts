import { describe, expect, it } from "vitest";
import { API_OPERATIONS } from "@/lib/http/api-catalogue";
import { HTTP_VERBS, routeFiles, serverActionFiles } from "./route-files";

// Public on purpose: the readiness probe, the API description, sign-in itself, unsubscribing from mail.
const PUBLIC_ALLOW_LIST = new Set([
  "GET /api/health",
  "GET /api/openapi.json",
  "GET /api/ping",
  "POST /api/sign-in-link",
  // One-click unsubscribe from a mail (RFC 8058): mail clients post without a session; a signed token names the person.
  "GET /api/unsubscribe",
  "POST /api/unsubscribe",
  "GET /api/auth/[...nextauth]",
  "POST /api/auth/[...nextauth]",
]);
const PUBLIC_ACTIONS = new Set(["signInWithPassword", "requestLinkAction", "signInWithLinkAction", "signOutAction", "acceptInvitationAction"]);

describe("every route and server action goes through the gate", () => {
  const files = routeFiles();

  it("finds the route files", () => {
    expect(files.length).toBeGreaterThan(8);
  });

  for (const { file, apiPath } of files) {
    it(`${apiPath} exports only gated handlers`, async () => {
      const mod = await import(file);
      const verbs = HTTP_VERBS.filter((v) => v in mod);
      expect(verbs.length).toBeGreaterThan(0);
      for (const verb of verbs) {
        const key = `${verb} ${apiPath}`;
        const gate = mod[verb]?.gate;
        expect(gate, `${key} is not wrapped by withPermission/publicRoute`).toBeTruthy();
        if (gate.permission === "public") expect(PUBLIC_ALLOW_LIST.has(key), `${key} is public but not on the allow-list`).toBe(true);
        if (!apiPath.startsWith("/api/auth/")) {
          const op = API_OPERATIONS.find((o) => o.method === verb && o.path === apiPath);
          expect(op, `${key} is missing from the API catalogue (lib/http/api-catalogue.ts, api-operations-figures.ts)`).toBeTruthy();
          expect(op!.permission).toBe(gate.permission);
        }
      }
    });
  }

  it("the catalogue names no route that does not exist", () => {
    const existing = new Set(files.map((f) => f.apiPath));
    for (const op of API_OPERATIONS) expect(existing.has(op.path), op.path).toBe(true);
  });

  it("every server action is wrapped", async () => {
    const actionFiles = serverActionFiles();
    expect(actionFiles.length).toBeGreaterThan(0);
    for (const file of actionFiles) {
      const mod = await import(file);
      for (const [name, fn] of Object.entries(mod)) {
        const gate = (fn as { gate?: { permission: string } }).gate;
        expect(gate, `${name} in ${file} is not wrapped by withAction/publicAction`).toBeTruthy();
        if (gate!.permission === "public") expect(PUBLIC_ACTIONS.has(name), `${name} is public but not allow-listed`).toBe(true);
      }
    }
  });
});
