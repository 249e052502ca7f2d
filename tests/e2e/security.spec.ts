import { spawn } from "node:child_process";
import os from "node:os";
import { type Page } from "@playwright/test";
import { expect, test } from "./fixtures";
import { DEMO_MANUSCRIPT, shoot, signIn } from "./helpers";

const SPEC = {
  $schema: "https://vega.github.io/schema/vega-lite/v6.json",
  data: { name: "echo" },
  mark: "point",
  encoding: { x: { field: "tau", type: "quantitative" }, y: { field: "signal", type: "quantitative" } },
};

/** This machine's first address that is not loopback: requests to it arrive from a non-loopback peer. */
function externalAddress(): string {
  for (const list of Object.values(os.networkInterfaces())) {
    for (const a of list ?? []) if (!a.internal && a.family === "IPv4") return a.address;
  }
  throw new Error("this test needs a network interface besides loopback (none found)");
}

function expectStrictPolicy(csp: string | null | undefined, where: string) {
  expect(csp, `${where}: Content-Security-Policy`).toBeTruthy();
  expect(csp!, where).toMatch(/script-src 'self' 'nonce-[A-Za-z0-9+/=]{16,}' 'strict-dynamic'/);
  expect(csp!, where).not.toContain("unsafe-eval");
  expect(csp!, where).toContain("frame-ancestors 'none'");
  expect(csp!, where).toContain("object-src 'none'");
}

/** Records CSP violations the page reports, so a test can assert there were none (or some). */
async function watchViolations(page: Page) {
  await page.addInitScript(() => {
    (window as unknown as { __violations: string[] }).__violations = [];
    document.addEventListener("securitypolicyviolation", (e) => {
      (window as unknown as { __violations: string[] }).__violations.push(`${e.violatedDirective} ${e.blockedURI}`);
    });
  });
  return () => page.evaluate(() => (window as unknown as { __violations: string[] }).__violations);
}

test.describe.serial("security at the edge", () => {
  let panelId = "";
  let versionId = "";

  test("every page carries a nonce CSP; the app's own scripts and charts run under it with no violation", async ({ page }) => {
    const violations = await watchViolations(page);
    const signInPage = await page.goto("/sign-in");
    expectStrictPolicy(signInPage?.headers()["content-security-policy"], "/sign-in");
    await signIn(page, "author@lab.example.org");
    const origin = new URL(page.url()).origin;
    const { items } = await (await page.request.get(`/api/manuscripts/${DEMO_MANUSCRIPT}/datasets`)).json();
    const echo = items.find(
      (d: { kind: string; tags: Record<string, string>; latestVersion: unknown }) => d.kind === "hahn_echo" && !d.tags.derivedFrom && d.latestVersion,
    );
    versionId = echo.latestVersion.id;
    const post = async (url: string, data: unknown) => {
      const res = await page.request.post(url, { data, headers: { origin } });
      expect(res.status(), await res.text()).toBe(201);
      return res.json();
    };
    const figure = await post("/api/figures", { manuscriptId: DEMO_MANUSCRIPT, title: "Security: CSP" });
    const panel = await post(`/api/figures/${figure.id}/panels`, { title: "echo" });
    panelId = panel.id;
    await post(`/api/panels/${panel.id}/revisions`, { spec: SPEC, bindings: { echo: { versionId } }, baseRevisionId: null, message: "first" });

    for (const path of ["/manuscripts", `/manuscripts/${DEMO_MANUSCRIPT}`, `/figures/${figure.id}`, `/panels/${panel.id}`, "/dev/mail"]) {
      const res = await page.goto(path);
      expect(res?.status(), path).toBe(200);
      expectStrictPolicy(res?.headers()["content-security-policy"], path);
      expect(res?.headers()["x-content-type-options"], path).toBe("nosniff");
      expect(res?.headers()["referrer-policy"], path).toBe("same-origin");
    }
    await page.goto(`/panels/${panel.id}`);
    // The chart drew: Vega ran through the interpreter without eval.
    await expect(page.getByTestId("panel-chart").locator("svg").first()).toBeVisible();
    await shoot(page, "security-panel-under-csp");
    expect(await violations()).toEqual([]);
  });

  test("script a spec or comment might smuggle in is blocked by the policy", async ({ page, consoleGuard }) => {
    consoleGuard.allow(/violates the following Content Security Policy directive/, "the smuggled script is blocked, which is what this test checks");
    const violations = await watchViolations(page);
    await signIn(page, "reviewer@partner.example.org");
    await page.goto(`/panels/${panelId}`);
    await expect(page.getByTestId("panel-chart").locator("svg").first()).toBeVisible();
    await page.evaluate(() => {
      document.body.insertAdjacentHTML("beforeend", '<img alt="" src="data:," onerror="window.__pwned1 = 1">');
    });
    // What a hostile embed option did: open a window and write the spec's HTML into it.
    const [popup] = await Promise.all([
      page.waitForEvent("popup"),
      page.evaluate(() => {
        const w = window.open("", "_blank");
        const close = "</" + "script>";
        w?.document.write(`<p>source</p><script>window.opener.__pwned2 = 1${close}`);
        w?.document.close();
      }),
    ]);
    await popup.close();
    // Reported in this page (the popup reports its own); without the policy both flags would be set.
    await expect.poll(async () => (await violations()).length).toBeGreaterThanOrEqual(1);
    const flags = await page.evaluate(() => [1, 2].map((i) => (window as unknown as Record<string, unknown>)[`__pwned${i}`] ?? null));
    expect(flags).toEqual([null, null]);
    expect((await violations()).join("\n")).toMatch(/script-src/);
  });

  test("a spec with embed options in usermeta is refused when saved", async ({ page }) => {
    await signIn(page, "author@lab.example.org");
    const origin = new URL(page.url()).origin;
    const panel = await (await page.request.get(`/api/panels/${panelId}`)).json();
    const hostile = { ...SPEC, usermeta: { embedOptions: { actions: true, sourceHeader: "<script>window.__pwned4=1</script>" } } };
    const res = await page.request.post(`/api/panels/${panelId}/revisions`, {
      data: { spec: hostile, bindings: { echo: { versionId } }, baseRevisionId: panel.currentRevision.id, message: "hostile" },
      headers: { origin },
    });
    expect(res.status()).toBe(422);
    expect(JSON.stringify(await res.json())).toContain("usermeta.embedOptions");
  });

  test("downloads and API answers carry a policy that runs nothing", async ({ page }) => {
    await signIn(page, "viewer@lab.example.org");
    const raw = await page.request.get(`/api/versions/${versionId}/raw`);
    expect(raw.status()).toBe(200);
    expect(raw.headers()["content-security-policy"]).toContain("sandbox");
    expect(raw.headers()["content-security-policy"]).toContain("default-src 'none'");
    expect(raw.headers()["content-disposition"]).toMatch(/^attachment;/);
    expect(raw.headers()["x-content-type-options"]).toBe("nosniff");
  });

  test("the mail outbox cannot be reached from another machine, whatever X-Forwarded-For says", async ({ request }) => {
    const port = new URL(test.info().project.use.baseURL!).port;
    const remote = `http://${externalAddress()}:${port}`;
    for (const path of ["/dev/mail", "/sign-in"]) {
      const res = await request.get(`${remote}${path}`, { headers: { "x-forwarded-for": "127.0.0.1", "x-prooflight-peer": "127.0.0.1" } });
      if (path === "/dev/mail") expect(res.status()).toBe(404);
      else expect(await res.text()).not.toContain("mail outbox");
    }
    // From this machine the demo instance shows it.
    expect((await request.get("/dev/mail")).status()).toBe(200);
  });

  test("a production instance has no mail outbox page, not even for this machine", async ({ request }) => {
    test.setTimeout(120_000);
    const port = String(Number(new URL(test.info().project.use.baseURL!).port) + 7);
    const child = spawn(process.execPath, ["node_modules/next/dist/bin/next", "start", "-p", port], {
      env: { ...process.env, PORT: port, APP_URL: `http://localhost:${port}`, PROOFLIGHT_INSTANCE: "production", NEXT_TELEMETRY_DISABLED: "1" },
      detached: true,
      stdio: "ignore",
    });
    try {
      await expect.poll(async () => (await request.get(`http://localhost:${port}/api/health`).catch(() => null))?.status() ?? 0, { timeout: 90_000 }).toBe(200);
      expect((await request.get(`http://localhost:${port}/dev/mail`)).status()).toBe(404);
      expect(await (await request.get(`http://localhost:${port}/sign-in`)).text()).not.toContain("mail outbox");
    } finally {
      if (child.pid) process.kill(-child.pid, "SIGTERM");
    }
  });

  test("signing out ends the session on the server: the old cookie no longer works", async ({ newContext, playwright }) => {
    const context = await newContext();
    const page = await context.newPage();
    await signIn(page, "viewer@lab.example.org");
    const state = await context.storageState();
    const before = await playwright.request.newContext({ baseURL: test.info().project.use.baseURL, storageState: state });
    expect((await before.get("/api/me")).status()).toBe(200);
    await page.getByRole("button", { name: "Sign out" }).click();
    await expect(page).toHaveURL(/\/sign-in/);
    const after = await playwright.request.newContext({ baseURL: test.info().project.use.baseURL, storageState: state });
    expect((await after.get("/api/me")).status()).toBe(401);
    const pageAfter = await after.get("/manuscripts", { maxRedirects: 0 });
    expect([303, 307, 302]).toContain(pageAfter.status());
    expect(pageAfter.headers()["location"]).toContain("/sign-in");
    await Promise.all([before.dispose(), after.dispose(), context.close()]);
  });

  test("a server action posted without an Origin header is refused", async ({ page, playwright }) => {
    // Capture the sign-in action exactly as the browser sends it (with a wrong password, so nothing signs in)…
    await page.goto("/sign-in");
    const captured = page.waitForRequest((r) => r.method() === "POST" && Boolean(r.headers()["next-action"]));
    await page.getByLabel("E-mail", { exact: true }).fill("viewer@lab.example.org");
    await page.getByLabel("Password").fill("not-the-password");
    await page.getByRole("button", { name: "Sign in" }).click();
    const sent = await captured;
    expect((await sent.allHeaders())["origin"]).toBeTruthy();
    // …then replay it as a script would, with the right password and no Origin header.
    const body = sent.postData()!.replace("not-the-password", "prooflight-demo");
    const script = await playwright.request.newContext({ baseURL: test.info().project.use.baseURL });
    const res = await script.post("/sign-in", {
      headers: { "next-action": sent.headers()["next-action"]!, "content-type": sent.headers()["content-type"]!, accept: "text/x-component" },
      data: body,
      maxRedirects: 0,
    });
    expect(res.headers()["set-cookie"] ?? "").not.toMatch(/authjs\.session-token=/);
    expect(await res.text()).toContain("no Origin header");
    // The same replay with our Origin signs in: the refusal above is the Origin check, not a broken replay.
    const withOrigin = await script.post("/sign-in", {
      headers: {
        "next-action": sent.headers()["next-action"]!,
        "content-type": sent.headers()["content-type"]!,
        accept: "text/x-component",
        origin: new URL(page.url()).origin,
      },
      data: body,
      maxRedirects: 0,
    });
    expect(withOrigin.headers()["set-cookie"] ?? "").toMatch(/authjs\.session-token=/);
    await script.dispose();
  });
});
