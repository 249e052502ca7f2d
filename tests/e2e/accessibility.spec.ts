import AxeBuilder from "@axe-core/playwright";
import type { Page } from "@playwright/test";
import { expect, test } from "./fixtures";
import { DEMO_MANUSCRIPT, shoot, signIn } from "./helpers";

// WCAG 2.0/2.1 level A and AA rules; a serious or critical violation anywhere fails the walk.
const TAGS = ["wcag2a", "wcag2aa", "wcag21a", "wcag21aa"];

interface Finding {
  page: string;
  rule: string;
  impact: string;
  targets: string[];
}

async function audit(page: Page, label: string): Promise<Finding[]> {
  await page.waitForLoadState("networkidle");
  // The outbox shows a mail's HTML in a sandboxed frame that runs no script, so axe cannot run inside it.
  const result = await new AxeBuilder({ page }).withTags(TAGS).exclude("iframe[sandbox]").analyze();
  return result.violations
    .filter((v) => v.impact === "serious" || v.impact === "critical")
    .map((v) => ({ page: label, rule: `${v.id}: ${v.help}`, impact: v.impact!, targets: v.nodes.slice(0, 5).map((n) => n.target.join(" ")) }));
}

/** The first link on the page whose address starts with `prefix`, as a path. */
async function firstLink(page: Page, prefix: string): Promise<string> {
  const href = await page.locator(`a[href^="${prefix}"]`).first().getAttribute("href");
  expect(href, `a link starting with ${prefix} on ${page.url()}`).toBeTruthy();
  return href!;
}

test("signed-out pages have no serious or critical accessibility violation", async ({ page, consoleGuard }) => {
  consoleGuard.allow(/status of 404/, "an unknown invitation and a missing page answer 404");
  const findings: Finding[] = [];
  for (const [label, path] of [
    ["sign-in", "/sign-in"],
    ["sign-in link, expired", "/sign-in/link?token=not-a-real-token"],
    ["invitation, unknown", "/invite/not-a-real-token"],
    ["missing page", "/no-such-page"],
  ] as const) {
    await page.goto(path);
    await expect(page.locator("h1").first()).toBeVisible();
    findings.push(...(await audit(page, label)));
  }
  expect(findings).toEqual([]);
});

// Pages reached by following the first link of a kind from a listing page, as a user would.
const PI_PAGES: { label: string; path: string; follow?: string }[] = [
  { label: "manuscripts", path: "/manuscripts" },
  { label: "manuscript", path: `/manuscripts/${DEMO_MANUSCRIPT}` },
  { label: "figure status", path: `/manuscripts/${DEMO_MANUSCRIPT}/status` },
  { label: "activity", path: `/manuscripts/${DEMO_MANUSCRIPT}/activity` },
  { label: "data", path: `/manuscripts/${DEMO_MANUSCRIPT}/data` },
  { label: "analyses", path: `/manuscripts/${DEMO_MANUSCRIPT}/analyses` },
  { label: "members", path: `/manuscripts/${DEMO_MANUSCRIPT}/members` },
  { label: "house style", path: `/manuscripts/${DEMO_MANUSCRIPT}/house-style` },
  { label: "bundles", path: `/manuscripts/${DEMO_MANUSCRIPT}/bundles` },
  { label: "waiting on me", path: "/review" },
  { label: "calculators", path: "/calculators" },
  { label: "API tokens", path: "/settings/tokens" },
  { label: "mail outbox", path: "/dev/mail" },
  { label: "one mail", path: "/dev/mail", follow: "/dev/mail/" },
  { label: "dataset", path: `/manuscripts/${DEMO_MANUSCRIPT}/data`, follow: "/datasets/" },
  { label: "fit", path: `/manuscripts/${DEMO_MANUSCRIPT}/data`, follow: "/datasets/" },
  { label: "figure", path: `/manuscripts/${DEMO_MANUSCRIPT}/status`, follow: "/figures/" },
];

test.describe("as the PI, no page has a serious or critical accessibility violation", () => {
  test.beforeEach(async ({ page }) => signIn(page, "pi@lab.example.org"));

  for (const { label, path, follow } of PI_PAGES) {
    test(label, async ({ page }) => {
      await page.goto(path);
      if (follow) await page.goto(await firstLink(page, follow));
      if (label === "fit") await page.goto(await firstLink(page, "/versions/"));
      await expect(page.locator("h1").first()).toBeVisible();
      expect(await audit(page, label)).toEqual([]);
    });
  }

  test("panel, every tab", async ({ page }) => {
    await page.goto(`/manuscripts/${DEMO_MANUSCRIPT}/status`);
    await page.goto(await firstLink(page, "/panels/"));
    await expect(page.locator("h1").first()).toBeVisible();
    const findings = await audit(page, "panel");
    for (const tab of await page.getByRole("tab").all()) {
      const name = (await tab.textContent())?.trim() ?? "tab";
      await tab.click();
      await expect(tab).toHaveAttribute("aria-selected", "true");
      findings.push(...(await audit(page, `panel, ${name} tab`)));
    }
    await shoot(page, "a11y-panel");
    expect(findings).toEqual([]);
  });
});

test("the reviewer's pages have no serious or critical accessibility violation on a phone", async ({ page }) => {
  await page.setViewportSize({ width: 390, height: 844 });
  await signIn(page, "reviewer@partner.example.org");
  const findings: Finding[] = [];
  await page.goto("/review");
  await expect(page.locator("h1").first()).toBeVisible();
  findings.push(...(await audit(page, "waiting on me, phone")));
  await page.goto(`/manuscripts/${DEMO_MANUSCRIPT}/status`);
  findings.push(...(await audit(page, "figure status, phone")));
  await page.goto(await firstLink(page, "/panels/"));
  await expect(page.locator("h1").first()).toBeVisible();
  findings.push(...(await audit(page, "panel, phone")));
  expect(findings).toEqual([]);
});
