import type { Client } from "@libsql/client";
import { beforeAll, describe, expect, it } from "vitest";
import { getClient } from "@/db/client";
import { authorize } from "@/lib/authz";
import { DEMO_ACCOUNTS, DEMO_MANUSCRIPT_ID } from "@/lib/demo-data/accounts";
import { changeMemberRole, removeMember } from "@/lib/server/members";
import { withRequestMemo } from "@/lib/request-memo";
import { setupTestApp } from "./harness";

/** Within one request the caller's role is asked once; a membership write in that request is seen at once. */
const who = (id: string) => DEMO_ACCOUNTS.find((a) => a.id === id)!;
const pi = who("demo-pi");
const viewer = who("demo-viewer");

function countStatements() {
  const client = getClient();
  const execute = client.execute.bind(client);
  let n = 0;
  client.execute = ((stmt: Parameters<Client["execute"]>[0]) => (n++, execute(stmt))) as Client["execute"];
  return { count: () => ((client.execute = execute as Client["execute"]), n) };
}

beforeAll(async () => {
  await setupTestApp();
});

describe("roles asked once per request", () => {
  it("the gate and the service behind it share one lookup", async () => {
    const statements = countStatements();
    await withRequestMemo(async () => {
      expect(await authorize(viewer, "manuscript.read", DEMO_MANUSCRIPT_ID)).toBe("viewer");
      expect(await authorize(viewer, "manuscript.read", DEMO_MANUSCRIPT_ID)).toBe("viewer");
    });
    expect(statements.count()).toBe(1);
  });

  it("a role changed or a member removed earlier in the same request counts for what follows", async () => {
    await withRequestMemo(async () => {
      await expect(authorize(viewer, "figure.edit", DEMO_MANUSCRIPT_ID)).rejects.toMatchObject({ status: 403 });
      await changeMemberRole(pi, DEMO_MANUSCRIPT_ID, viewer.id, { role: "author" });
      expect(await authorize(viewer, "figure.edit", DEMO_MANUSCRIPT_ID)).toBe("author");
      await removeMember(pi, DEMO_MANUSCRIPT_ID, viewer.id);
      await expect(authorize(viewer, "manuscript.read", DEMO_MANUSCRIPT_ID)).rejects.toMatchObject({ status: 404 });
    });
  });

  it("another request asks again", async () => {
    await withRequestMemo(async () => {
      await expect(authorize(viewer, "manuscript.read", DEMO_MANUSCRIPT_ID)).rejects.toMatchObject({ status: 404 });
    });
  });
});
