import { createHash } from "node:crypto";
import { type Page } from "@playwright/test";
import { expect, test } from "./fixtures";
import { DEMO_MANUSCRIPT, shoot, signIn } from "./helpers";

const VALID = { name: "echo-e2e.csv", mimeType: "text/csv", buffer: Buffer.from("tau (µs),signal\n1,0.9\n2,0.8\n") };
const RAGGED = { name: "ragged-e2e.csv", mimeType: "text/csv", buffer: Buffer.from("tau (µs),signal\n1,0.9\n2,0.8,0.7\n3,0.6\n") };
const SECOND = { name: "echo-e2e-v2.csv", mimeType: "text/csv", buffer: Buffer.from("tau (µs),signal\n1,0.91\n2,0.79\n4,0.55\n") };

const datasetsTable = (page: Page) => page.getByRole("table", { name: "Datasets of this manuscript" });

async function openDataset(page: Page, name: RegExp) {
  await page.goto(`/manuscripts/${DEMO_MANUSCRIPT}/data`);
  // Fits add derived datasets whose names start with the source's; take the source itself.
  await datasetsTable(page).getByRole("link", { name }).first().click();
  await expect(page.getByRole("heading", { level: 1, name }).first()).toBeVisible();
}

test("the author uploads two files at once: one is stored, the other is refused with its line", async ({ page, consoleGuard }) => {
  consoleGuard.allow(/status of 422 .*\/api\/manuscripts\/demo-manuscript\/datasets$/, "the malformed file is refused");
  await signIn(page, "author@lab.example.org");
  await page.goto(`/manuscripts/${DEMO_MANUSCRIPT}`);
  await page.getByRole("link", { name: /\d+ datasets/ }).click();
  await expect(page.getByRole("heading", { level: 1, name: "Data" })).toBeVisible();
  await expect(datasetsTable(page).getByRole("link", { name: "Hahn echo, NV03 (sample K17)", exact: true })).toBeVisible();
  const countText = await page.getByText(/\d+ datasets ·/).textContent();
  const before = Number(/(\d+) datasets/.exec(countText ?? "")![1]);
  await expect(page.getByTestId("curl-line")).toContainText(`-F name="Hahn echo NV03" http://localhost:`);

  await page.getByLabel("Measurement kind").selectOption("hahn_echo");
  await page.getByLabel("Sample", { exact: true }).fill("K17");
  await page.getByLabel("Tags").fill("group=e2e, centre=NV99");
  await page.getByTestId("upload-input").setInputFiles([VALID, RAGGED]);

  const uploads = page.getByRole("list", { name: "Uploads" });
  await expect(uploads.getByRole("progressbar").first()).toBeVisible();
  const good = uploads.getByRole("listitem").filter({ hasText: VALID.name });
  const bad = uploads.getByRole("listitem").filter({ hasText: RAGGED.name });
  await expect(good).toContainText(/✓ stored as version 1 · sha256 [0-9a-f]{8}… · 2 rows/);
  await expect(good.getByRole("progressbar")).toHaveAttribute("aria-valuenow", "100");
  await expect(bad).toContainText(/✕ ragged-e2e\.csv, line 3, column 3/);
  await expect(page.getByText(`${before + 1} datasets ·`)).toBeVisible();
  const row = datasetsTable(page).getByRole("row").filter({ hasText: "echo-e2e" });
  await expect(row).toContainText("Hahn echo");
  await expect(row).toContainText("centre=NV99");
  await shoot(page, "data");

  await good.getByRole("link", { name: "open dataset" }).click();
  await expect(page.getByRole("heading", { level: 1, name: "echo-e2e" })).toBeVisible();
  const sha = createHash("sha256").update(VALID.buffer).digest("hex");
  const versions = page.getByRole("table", { name: /Versions of this dataset/ });
  await expect(versions.getByTestId("version-sha")).toHaveText(`${sha.slice(0, 8)}…`);
  await expect(versions.getByTestId("version-sha")).toHaveAttribute("title", sha);
  const rows = page.getByRole("table", { name: /Rows 1 to 2 of version 1/ });
  await expect(rows.getByRole("row")).toHaveCount(3);
  await expect(rows.getByRole("row").nth(1)).toContainText("0.9");
  await expect(rows.getByRole("row").nth(2)).toContainText("0.8");
  await expect(page.getByTestId("rows-range")).toContainText("rows 1–2 of 2");

  const href = await versions.getByRole("link", { name: /Download original/ }).getAttribute("href");
  const raw = await page.request.get(href!);
  expect(Buffer.from(await raw.body()).equals(VALID.buffer)).toBe(true);

  await page.getByTestId("upload-input").setInputFiles([SECOND]);
  await expect(page.getByRole("list", { name: "Uploads" })).toContainText(/✓ stored as version 2 .* 3 rows/);
  await expect(versions.getByTestId("version-row")).toHaveCount(2);
  await expect(page.getByRole("heading", { name: /Version 2/ })).toBeVisible();
  await versions.getByRole("link", { name: "Show version 1" }).click();
  await expect(page.getByRole("heading", { name: /Version 1 \(an earlier version\)/ })).toBeVisible();
});

test("the author edits a dataset's details; a bad date is refused with the server's message", async ({ page, consoleGuard }) => {
  consoleGuard.allow(/status of 400 .*\/api\/datasets\/[\w-]+$/, "the bad date is refused");
  await signIn(page, "author@lab.example.org");
  await openDataset(page, /T1 relaxation, NV01/);
  await page.getByRole("button", { name: "Edit details" }).click();
  await page.getByLabel("Measured").fill("last Tuesday");
  await page.getByRole("button", { name: "Save details" }).click();
  await expect(page.getByRole("alert").filter({ hasText: "measuredAt must be a date" })).toBeVisible();
  await page.getByLabel("Measured").fill("2026-02-09");
  await page.getByLabel("Notes").fill("Re-measured after realigning the objective.");
  await page.getByRole("button", { name: "Save details" }).click();
  await expect(page.getByRole("status").filter({ hasText: "Saved." })).toBeVisible();
  await expect(page.getByText("Re-measured after realigning the objective.")).toBeVisible();
});

test("the viewer sees the datasets but no drop zone and no edit form", async ({ page }) => {
  await signIn(page, "viewer@lab.example.org");
  await page.goto(`/manuscripts/${DEMO_MANUSCRIPT}/data`);
  await expect(datasetsTable(page).getByRole("link", { name: "Hahn echo, NV03 (sample K17)", exact: true })).toBeVisible();
  await expect(page.getByText("Only the PI and authors upload data.")).toBeVisible();
  await expect(page.getByTestId("drop-zone")).toHaveCount(0);
  await shoot(page, "data-viewer");
  await datasetsTable(page).getByRole("link", { name: "Hahn echo, NV03 (sample K17)", exact: true }).click();
  await expect(page.getByTestId("quick-plot")).toBeVisible();
  await expect(page.getByRole("button", { name: "Edit details" })).toHaveCount(0);
  await expect(page.getByTestId("drop-zone")).toHaveCount(0);
  await page.setViewportSize({ width: 390, height: 844 });
  await shoot(page, "dataset-narrow");
});

test("a demo echo file shows the quick plot; the 2,000-row ODMR sweep pages through the server", async ({ page }) => {
  await signIn(page, "reviewer@partner.example.org");
  await openDataset(page, /Hahn echo, NV03/);
  const plot = page.getByTestId("quick-plot");
  await expect(plot).toBeVisible();
  await expect(plot).toContainText("tau (µs)");
  await expect(plot).toContainText("signal (norm)");
  expect((await plot.locator("path").getAttribute("d"))!.length).toBeGreaterThan(200);
  // Echo delays span decades: the time axis is logarithmic by default, and the switch beside it goes linear.
  // (by role: the plot's own aria-label says "(log x)" too)
  await expect(page.getByRole("radio", { name: "log x" })).toBeChecked();
  await expect(plot).toHaveAttribute("aria-label", /\(log x\)/);
  await page.getByRole("radio", { name: "linear x" }).check();
  await expect(plot).not.toHaveAttribute("aria-label", /\(log x\)/);
  await page.getByRole("radio", { name: "log x" }).check();
  await expect(plot).toHaveAttribute("aria-label", /\(log x\)/);
  await expect(page.getByRole("table", { name: /Column summary/ })).toContainText("tau");
  await shoot(page, "dataset");

  await openDataset(page, /ODMR, NV06/);
  const range = page.getByTestId("rows-range");
  await expect(range).toHaveText(/rows 1–50 of 2,000/);
  await page.getByRole("button", { name: "Next page" }).click();
  await expect(range).toHaveText(/rows 51–100 of 2,000$/);
  const rows = page.getByRole("table", { name: /Rows 51 to 100/ });
  await expect(rows.getByRole("row").nth(1)).toContainText("51");
  await page.getByRole("button", { name: "Last page" }).click();
  await expect(range).toHaveText(/rows 1,951–2,000 of 2,000$/);
  await expect(page.getByRole("button", { name: "Next page" })).toBeDisabled();
  await expect(page.getByTestId("downsampled-note")).toContainText("min/max per pixel column, extremes kept");
  await shoot(page, "dataset-odmr");

  await openDataset(page, /PL scan 07/);
  await expect(page.getByTestId("quick-plot").locator("circle").first()).toBeVisible();
  await expect(page.getByTestId("downsampled-note")).toContainText("every k-th row");
  await shoot(page, "dataset-pl-map");
});
