import { type Page } from "@playwright/test";
import { expect, test } from "./fixtures";
import { DEMO_MANUSCRIPT, shoot, signIn } from "./helpers";

interface ListedDataset {
  id: string;
  name: string;
  kind: string;
  tags: Record<string, string>;
  latestVersion: { id: string } | null;
}

/** A demo Hahn-echo measurement (not a derived fit dataset) and its current version. */
async function echoSources(page: Page): Promise<ListedDataset[]> {
  const res = await page.request.get(`/api/manuscripts/${DEMO_MANUSCRIPT}/datasets`);
  expect(res.status()).toBe(200);
  const { items } = (await res.json()) as { items: ListedDataset[] };
  return items.filter((d) => d.kind === "hahn_echo" && !d.tags.derivedFrom && d.latestVersion);
}

test("the author fits a Hahn echo, sees T2 in µs with χ²ᵣ, and saves the run with a derived version", async ({ page }) => {
  await signIn(page, "author@lab.example.org");
  const [echo] = await echoSources(page);
  await page.goto(`/versions/${echo!.latestVersion!.id}/fit`);
  await expect(page.getByRole("heading", { level: 1 })).toContainText(echo!.name);
  await expect(page.getByText("Fits give estimates, not calibrations.")).toBeVisible();

  await page.getByLabel("Model", { exact: true }).selectOption("hahn_echo");
  await expect(page.getByTestId("model-formula")).toContainText("S(t) = S₀ + A·exp(−(t/T₂)ⁿ)");
  await expect(page.getByLabel("x column")).toHaveValue("tau");
  await expect(page.getByLabel("y column")).toHaveValue("signal");
  await expect(page.getByLabel("σ column")).toHaveValue("sigma");

  await page.getByLabel("T2 start value").fill("abc");
  await page.getByRole("button", { name: "Fit", exact: true }).click();
  await expect(page.getByRole("alert").filter({ hasText: "T2 start value" })).toContainText("T2 start value: “abc” is not a number.");
  await page.getByLabel("T2 start value").fill("");

  // One end of the range typed, the other left to the model's default: the stretch exponent pinned low hits its bound.
  await page.getByLabel("n range to").fill("1.5");
  await page.getByRole("button", { name: "Fit", exact: true }).click();
  await expect(page.getByRole("list", { name: "Fit warnings" })).toContainText("⚠hit a bound: n");
  await expect(page.getByTestId("param-n")).toContainText("at a bound");
  await expect(page.getByLabel("n range from")).toHaveAttribute("placeholder", "0.5");
  await page.getByLabel("n range to").fill("");
  // The "fixed" switch, by keyboard: the value field now holds n at the last fitted value and the range rests.
  const holdN = page.getByRole("switch", { name: "Hold n fixed" });
  await holdN.focus();
  await page.keyboard.press("Space");
  await expect(holdN).toBeChecked();
  await expect(page.getByLabel("n held value")).toHaveValue(/^\d/);
  await expect(page.getByLabel("n range from")).toBeDisabled();
  await page.keyboard.press("Space");
  await expect(holdN).not.toBeChecked();
  await page.getByLabel("n start value").fill("");
  await expect(page.getByText("settings changed since this fit").first()).toBeVisible();
  await expect(page.getByRole("button", { name: "Save run" })).toBeDisabled();

  await page.getByRole("button", { name: "Fit", exact: true }).click();
  const t2 = page.getByTestId("param-T2");
  await expect(t2).toContainText("µs");
  await expect(t2).toContainText("±");
  await expect(page.getByTestId("chi2red")).toHaveText(/^\d+(\.\d+)?$/);
  await expect(page.getByText("χ²ᵣ", { exact: true }).first()).toBeVisible();
  await expect(page.getByText(/converged/).first()).toBeVisible();
  await expect(page.getByTestId("fit-plot")).toBeVisible();
  await expect(page.getByLabel("Logarithmic x axis")).toBeChecked();
  await shoot(page, "fit");

  // The seeded demo story already stored a run on every echo version: saving adds one, whose derived
  // version is the next of the fit's derived dataset (or the same one when the bytes are identical).
  const runsBefore = ((await (await page.request.get(`/api/versions/${echo!.latestVersion!.id}/analyses`)).json()) as { items: unknown[] }).items.length;
  await page.getByRole("button", { name: "Save run" }).click();
  const saved = page.getByRole("status").filter({ hasText: "Saved — derived version" });
  await expect(saved).toContainText(/Saved — derived version \d+/);
  const derivedLink = saved.getByRole("link", { name: /^derived version \d+$/ });
  await expect(derivedLink).toHaveAttribute("href", /^\/datasets\/[\w-]+\?v=[\w-]+$/);
  const runs = page.getByRole("table", { name: "Stored runs on this version" });
  await expect(runs.getByRole("row")).toHaveCount(runsBefore + 2); // the header and every run, the new one included
  await expect(runs).toContainText("Hahn echo decay");
  await expect(runs).toContainText(/T2 = [\d.]+ ± [\d.]+ µs/);
  await expect(runs.getByRole("link", { name: /^version \d+$/ }).first()).toBeVisible();
  await shoot(page, "fit-saved");

  await derivedLink.click();
  await expect(page.getByRole("heading", { level: 1 })).toContainText("fit: Hahn echo decay");
  await page.goto(`/datasets/${echo!.id}`);
  await page.getByRole("link", { name: "Fit this version →" }).click();
  await expect(page).toHaveURL(new RegExp(`/versions/${echo!.latestVersion!.id}/fit$`));
});

test("the author runs the batch of echo fits and sees population statistics by group", async ({ page }) => {
  test.setTimeout(150_000);
  await signIn(page, "author@lab.example.org");
  const sources = await echoSources(page);
  expect(sources).toHaveLength(12);
  await page.goto(`/manuscripts/${DEMO_MANUSCRIPT}`);
  await page.getByRole("link", { name: "Analyses", exact: true }).click();
  await expect(page.getByRole("heading", { level: 1, name: "Analyses" })).toBeVisible();
  await expect(page.getByLabel("Model", { exact: true })).toHaveValue("hahn_echo");
  await expect(page.getByLabel("Measurement kind", { exact: true })).toHaveValue("hahn_echo");

  await page.getByRole("button", { name: "Run 12 fits" }).click();
  const bar = page.getByRole("progressbar", { name: "Batch fit progress" });
  await expect(bar).toHaveAttribute("aria-valuemax", "12");
  await expect(bar).toHaveAttribute("aria-valuenow", "12", { timeout: 120_000 });
  await expect(page.getByTestId("batch-progress-text")).toHaveText("12/12 fits");
  const results = page.getByRole("table", { name: "Batch fit results" });
  await expect(results.getByRole("row")).toHaveCount(13);
  await expect(results.getByText("✓").first()).toBeVisible();
  await expect(results.getByText("converged")).toHaveCount(12);

  await expect(page.getByLabel("Parameter", { exact: true })).toHaveValue("T2");
  await expect(page.getByLabel("Group by", { exact: true })).toHaveValue("group");
  await expect(page.getByTestId("statistics-summary")).toContainText("12 fitted values of T2 (µs) in 3 groups by group");
  const groups = page.getByRole("table", { name: "Statistics of T2 per group" });
  await expect(groups.getByRole("row")).toHaveCount(4);
  for (const g of ["as-grown", "annealed-1200C", "oxygen-terminated"]) await expect(groups).toContainText(g);
  const pairs = page.getByRole("table", { name: "Comparisons between groups" });
  await expect(pairs.getByRole("row")).toHaveCount(4);
  await expect(pairs).toContainText("exact");
  await expect(page.getByTestId("strip-plot")).toBeVisible();
  await expect(page.getByText(/Welch's t-test/)).toBeVisible();
  await shoot(page, "batch");

  await page.getByLabel("Group by", { exact: true }).selectOption("kind");
  await expect(page.getByTestId("statistics-summary")).toContainText("in 1 group by kind");
});

test("the viewer sees fits read-only: no Fit button, no batch run", async ({ page }) => {
  await signIn(page, "viewer@lab.example.org");
  const [echo] = await echoSources(page);
  await page.goto(`/versions/${echo!.latestVersion!.id}/fit`);
  await expect(page.getByText("Fits give estimates, not calibrations.")).toBeVisible();
  await expect(page.getByText("Only the PI and authors run analyses.")).toBeVisible();
  await expect(page.getByRole("button", { name: "Fit", exact: true })).toHaveCount(0);
  await expect(page.getByRole("button", { name: "Save run" })).toHaveCount(0);
  await expect(page.getByRole("table", { name: "Stored runs on this version" })).toContainText("Hahn echo decay");
  await shoot(page, "fit-viewer");

  await page.goto(`/manuscripts/${DEMO_MANUSCRIPT}/analyses`);
  await expect(page.getByRole("button", { name: /^Run \d+ fits?$/ })).toHaveCount(0);
  await expect(page.getByTestId("statistics-summary")).toContainText("in 3 groups by group");
});
