import type { Page } from "@playwright/test";
import { expect, test } from "./fixtures";
import { DEMO_MANUSCRIPT, shoot, signIn } from "./helpers";

const PHONE = { width: 390, height: 844 };
const LAPTOP = { width: 1024, height: 768 };

/** The page itself never scrolls sideways: wide tables and charts scroll inside their own box. */
async function expectNoSidewaysScroll(page: Page) {
  await page.waitForLoadState("networkidle");
  const { scrollWidth, innerWidth } = await page.evaluate(() => ({ scrollWidth: document.documentElement.scrollWidth, innerWidth: window.innerWidth }));
  expect(scrollWidth, `${new URL(page.url()).pathname} is wider than the ${innerWidth} px window`).toBeLessThanOrEqual(innerWidth);
}

/** The element lies inside the window horizontally (nothing cut off at the right edge). */
async function expectWithinWidth(page: Page, locator: ReturnType<Page["locator"]>, what: string) {
  const box = await locator.boundingBox();
  expect(box, what).toBeTruthy();
  const width = page.viewportSize()!.width;
  expect(box!.x, `${what} starts inside the window`).toBeGreaterThanOrEqual(0);
  expect(box!.x + box!.width, `${what} ends inside the ${width} px window`).toBeLessThanOrEqual(width);
}

/** The address of the first link on the page matching `selector`. */
async function firstHref(page: Page, selector: string): Promise<string> {
  const href = await page.locator(selector).first().getAttribute("href");
  expect(href, `a link ${selector} on ${page.url()}`).toBeTruthy();
  return href!;
}

/** Every page a reader or commenter uses, found from the demo manuscript's own links: [name, path]. */
async function pagesToWalk(page: Page): Promise<Array<[string, string]>> {
  const manuscript = `/manuscripts/${DEMO_MANUSCRIPT}`;
  await page.goto(manuscript);
  const figure = await firstHref(page, 'a[href^="/figures/"]');
  await page.goto(figure);
  const panel = await firstHref(page, 'a[href^="/panels/"]');
  await page.goto(`${manuscript}/data`);
  const dataset = await firstHref(page, 'a[href^="/datasets/"]');
  await page.goto(dataset);
  const fit = await firstHref(page, 'a[href^="/versions/"][href$="/fit"]');
  return [
    ["manuscripts", "/manuscripts"],
    ["manuscript", manuscript],
    ["status", `${manuscript}/status`],
    ["activity", `${manuscript}/activity`],
    ["data", `${manuscript}/data`],
    ["analyses", `${manuscript}/analyses`],
    ["members", `${manuscript}/members`],
    ["waiting-on-me", "/review"],
    ["figure", figure],
    ["panel", panel],
    ["dataset", dataset],
    ["fit", fit],
    ["calculators", "/calculators"],
    ["tokens", "/settings/tokens"],
  ];
}

test.describe("on a phone (390 × 844)", () => {
  test.use({ viewport: PHONE });

  test("the reviewer opens the menu, goes to the queue, reads a waiting panel and comments on it", async ({ page }) => {
    await page.goto("/sign-in");
    await expectNoSidewaysScroll(page);
    await shoot(page, "phone-sign-in");
    await signIn(page, "reviewer@partner.example.org");
    await expectNoSidewaysScroll(page);

    // The compact bar: brand and a menu button; the links open as a list and close on Escape.
    const nav = page.getByRole("navigation", { name: "Main" });
    const menu = nav.getByRole("button", { name: "Menu" });
    await expect(menu).toHaveAttribute("aria-expanded", "false");
    await expect(nav.getByRole("link", { name: "Calculators" })).toBeHidden();
    await menu.click();
    await expect(menu).toHaveAttribute("aria-expanded", "true");
    await expect(nav.getByRole("link", { name: "Calculators" })).toBeVisible();
    await expect(nav.getByRole("button", { name: "Sign out" })).toBeVisible();
    await expect(nav).toContainText("reviewer@partner.example.org");
    await shoot(page, "phone-menu-open");
    await page.keyboard.press("Escape");
    await expect(menu).toHaveAttribute("aria-expanded", "false");
    await expect(menu).toBeFocused();
    await expect(nav.getByRole("link", { name: "Calculators" })).toBeHidden();

    // Through the menu to "Waiting on me"; the menu closes on the way.
    await menu.click();
    await nav.getByRole("link", { name: /^Waiting on me/ }).click();
    await expect(page.getByRole("heading", { level: 1, name: "Waiting on me" })).toBeVisible();
    await expect(menu).toHaveAttribute("aria-expanded", "false");
    await expectNoSidewaysScroll(page);
    await shoot(page, "phone-review-queue");

    // A panel waiting for review (the demo seeds Figure 2's depth panel for this reviewer).
    await page
      .getByRole("link", { name: /^review panel [a-z] \(revision \d+\)$/ })
      .first()
      .click();
    await expect(page).toHaveURL(/\/panels\//);
    const chart = page.getByRole("region", { name: "Current revision" });
    // Vega loads after the page (a large chunk): a hang guard, not a speed requirement.
    await expect(chart.locator("svg.marks")).toBeVisible({ timeout: 30_000 });
    await expect(chart.getByRole("alert")).toHaveCount(0);
    await expectWithinWidth(page, chart.getByRole("figure").first(), "the chart");
    await expectNoSidewaysScroll(page);

    // The review comes right under the chart, before the workspace tabs.
    const review = page.getByRole("complementary", { name: "Review" });
    const chartBox = (await chart.boundingBox())!;
    const reviewBox = (await review.boundingBox())!;
    const tabsBox = (await page.getByRole("tablist", { name: "Panel workspace" }).boundingBox())!;
    expect(reviewBox.y, "review below the chart").toBeGreaterThan(chartBox.y + chartBox.height - 1);
    expect(tabsBox.y, "tabs below the review").toBeGreaterThan(reviewBox.y + reviewBox.height - 1);

    // The workspace tabs follow the WAI-ARIA tabs pattern: one tab stop, arrows / Home / End move and select.
    const revisionsTab = page.getByRole("tab", { name: "Revisions" });
    await expect(revisionsTab).toHaveAttribute("aria-selected", "true");
    await revisionsTab.focus();
    await page.keyboard.press("Home");
    await expect(page.getByRole("tab", { name: "Spec editor" })).toBeFocused();
    await expect(page.getByRole("tab", { name: "Spec editor" })).toHaveAttribute("aria-selected", "true");
    await expect(page.getByRole("tabpanel", { name: "Spec editor" })).toBeVisible();
    await page.keyboard.press("ArrowLeft");
    await expect(revisionsTab).toBeFocused();
    await expect(page.getByRole("tabpanel", { name: "Revisions" })).toBeVisible();
    await expect(page.getByRole("tabpanel", { name: "Spec editor" })).toBeHidden();

    // Deciding and commenting are within reach.
    await expectWithinWidth(page, review.getByRole("button", { name: /^✓ Approve revision \d+$/ }), "the approve button");
    await expectWithinWidth(page, review.getByRole("button", { name: "✕ Needs revision" }), "the needs-revision button");
    const note = `Readable on a phone ${Date.now()}`;
    const composer = review.getByRole("textbox", { name: "New comment" });
    await composer.click();
    await page.keyboard.type(note);
    const post = review.getByRole("button", { name: "Post comment" });
    await expectWithinWidth(page, post, "the post button");
    await post.click();
    await expect(review.getByRole("list", { name: "Open threads" })).toContainText(note);
    await expect(review.getByText("sending…")).toHaveCount(0, { timeout: 30_000 }); // stored, not only shown
    await expectNoSidewaysScroll(page);
    await shoot(page, "phone-panel-commented");
  });

  test("the PI reads the figure status", async ({ page }) => {
    await signIn(page, "pi@lab.example.org");
    await page.goto(`/manuscripts/${DEMO_MANUSCRIPT}`);
    await page.getByRole("link", { name: "Figure status" }).click();
    await expect(page.getByRole("heading", { level: 1, name: "Figure status" })).toBeVisible();
    const figures = page.getByRole("region", { name: "Figures and panels" });
    await expect(figures.getByRole("heading", { level: 2, name: "Figure 1", exact: true })).toBeVisible();
    await expectWithinWidth(page, figures, "the figure list");
    await expectNoSidewaysScroll(page);
    await shoot(page, "phone-figure-status");
  });

  test("no page scrolls sideways", async ({ page }) => {
    test.setTimeout(240_000);
    await signIn(page, "pi@lab.example.org");
    for (const [, path] of await pagesToWalk(page)) {
      await page.goto(path);
      await expectNoSidewaysScroll(page);
    }
  });
});

test.describe("on a laptop (1024 × 768)", () => {
  test.use({ viewport: LAPTOP });

  test("every page a reader uses fits the window", async ({ page }) => {
    test.setTimeout(240_000);
    await page.goto("/sign-in");
    await expectNoSidewaysScroll(page);
    await signIn(page, "pi@lab.example.org");
    // The horizontal nav, on one line, with no menu button.
    const nav = page.getByRole("navigation", { name: "Main" });
    await expect(nav.getByRole("button", { name: "Menu" })).toBeHidden();
    await expect(nav.getByRole("link", { name: "Calculators" })).toBeVisible();
    const brand = (await nav.getByRole("link", { name: "Prooflight" }).boundingBox())!;
    const signOut = (await nav.getByRole("button", { name: "Sign out" }).boundingBox())!;
    expect(Math.abs(signOut.y + signOut.height / 2 - (brand.y + brand.height / 2)), "sign out on the brand's line").toBeLessThan(8);

    for (const [name, path] of await pagesToWalk(page)) {
      await page.goto(path);
      await expectNoSidewaysScroll(page);
      await shoot(page, `laptop-${name}`);
    }
  });
});

test("the figure page prints only the figure, at its true width", async ({ page }) => {
  await signIn(page, "pi@lab.example.org");
  await page.goto(`/manuscripts/${DEMO_MANUSCRIPT}`);
  await page.goto(await firstHref(page, 'a[href^="/figures/"]'));
  const size = await page.getByText(/^[\d.]+ mm × up to/).textContent();
  const widthMm = Number(/^([\d.]+) mm/.exec(size!)![1]);
  const title = (await page.getByRole("heading", { level: 1 }).textContent())!;
  // The screen zoom does not carry over to paper.
  await page.getByRole("button", { name: "Zoom in" }).click();
  await expect(page.getByTestId("zoom-level")).toHaveText("125 %");
  await expect(page.getByTestId("panel-tile-a").locator("svg.marks")).toBeVisible({ timeout: 30_000 });

  await page.emulateMedia({ media: "print" });
  const sheet = page.getByTestId("figure-sheet");
  await expect.poll(async () => (await sheet.boundingBox())!.width, { message: `${widthMm} mm at 96 px per inch` }).toBeCloseTo((widthMm * 96) / 25.4, 0);
  await expect(page.getByRole("heading", { level: 1 })).toHaveText(title);
  await expect(page.getByText(/^Coherence and proton NMR .* · printed \d{4}-\d\d-\d\d \d\d:\d\d UTC$/)).toBeVisible();
  for (const hidden of [
    page.getByRole("navigation", { name: "Main" }),
    page.getByRole("navigation", { name: "Breadcrumb" }),
    page.getByRole("region", { name: "Panels" }),
    page.getByRole("button", { name: "Zoom in" }),
    page.getByRole("region", { name: "Sign-off" }),
    page.getByRole("region", { name: "Export" }),
  ])
    await expect(hidden).toBeHidden();
  await shoot(page, "print-figure");
});
