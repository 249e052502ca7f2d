import fs from "node:fs";
import path from "node:path";
import { expect, type APIResponse, type Page } from "@playwright/test";

export const PASSWORD = "prooflight-demo";
export const DEMO_MANUSCRIPT = "demo-manuscript";

export async function signIn(page: Page, email: string, password = PASSWORD) {
  await page.goto("/sign-in");
  await page.getByLabel("E-mail", { exact: true }).fill(email);
  await page.getByLabel("Password").fill(password);
  await page.getByRole("button", { name: "Sign in" }).click();
  await expect(page).toHaveURL(/\/manuscripts/);
}

/** Screenshots land in screenshots/ so a person can look at every page the tests pass through. */
export async function shoot(page: Page, name: string) {
  fs.mkdirSync("screenshots", { recursive: true });
  await page.screenshot({ path: path.join("screenshots", `${name}.png`), fullPage: true });
}

interface SinkMessage {
  id: string;
  envelope: { to: string[] };
  subject: string;
  text: string;
}

function findMail(to: string, subject: RegExp): SinkMessage | undefined {
  const dir = process.env.MAIL_SINK_DIR!;
  if (!fs.existsSync(dir)) return undefined;
  return fs
    .readdirSync(dir)
    .filter((f) => f.endsWith(".json") && !f.startsWith("."))
    .map((f) => JSON.parse(fs.readFileSync(path.join(dir, f), "utf8")) as SinkMessage)
    .find((m) => m.envelope.to.includes(to) && subject.test(m.subject));
}

/**
 * Waits (Playwright's expect.poll, no hand-rolled sleep) for the sink started by the test runner
 * to hold a message to `to` matching `subject`; fails the test, naming the mail, if none arrives.
 * The timeout is a hang guard well inside the test's own, not a speed requirement.
 */
export async function waitForMail(to: string, subject: RegExp, timeoutMs = 30_000): Promise<SinkMessage> {
  await expect.poll(() => findMail(to, subject) !== undefined, { message: `a mail to ${to} matching ${subject}`, timeout: timeoutMs }).toBe(true);
  return findMail(to, subject)!;
}

/** JSON calls made with the page's session cookie; writes carry our Origin as a browser would. */
export function api(page: Page) {
  const headers = () => ({ origin: new URL(page.url()).origin });
  const expectJson = async (res: APIResponse, status: number) => {
    expect(res.status(), await res.text()).toBe(status);
    return res.json();
  };
  return {
    get: async (url: string) => expectJson(await page.request.get(url), 200),
    post: async (url: string, data: unknown, status = 201) => expectJson(await page.request.post(url, { data, headers: headers() }), status),
    patch: async (url: string, data: unknown) => expectJson(await page.request.patch(url, { data, headers: headers() }), 200),
  };
}

/** The fit page of the demo echo "Hahn echo, NV03 (sample K17)" (80 log-spaced τ from 1 to 2000 µs), with the echo model chosen; found by name, as other tests upload echoes of their own. */
export async function openDemoEchoFit(page: Page) {
  const res = await page.request.get(`/api/manuscripts/${DEMO_MANUSCRIPT}/datasets`);
  const { items } = (await res.json()) as { items: Array<{ name: string; latestVersion: { id: string } | null }> };
  const echo = items.find((d) => d.name === "Hahn echo, NV03 (sample K17)" && d.latestVersion)!;
  await page.goto(`/versions/${echo.latestVersion!.id}/fit`);
  await page.getByLabel("Model", { exact: true }).selectOption("hahn_echo");
}
