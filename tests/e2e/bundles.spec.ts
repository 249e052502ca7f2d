import { unzipSync, zipSync } from "fflate";
import { expect, test } from "./fixtures";
import { DEMO_MANUSCRIPT, shoot, signIn } from "./helpers";

test("the author downloads Figure 1's bundle, checks it, sees a changed byte named, and imports it as a new figure", async ({ page }) => {
  test.setTimeout(240_000);
  await signIn(page, "author@lab.example.org");
  await page.goto(`/manuscripts/${DEMO_MANUSCRIPT}`);
  await page
    .getByRole("link", { name: /^Figure 1\b/ })
    .first()
    .click();
  const [download] = await Promise.all([page.waitForEvent("download"), page.getByRole("link", { name: "Reproducibility bundle", exact: true }).click()]);
  const bundle = Buffer.concat(await (await download.createReadStream()).toArray());

  await page.goto(`/manuscripts/${DEMO_MANUSCRIPT}`);
  await page.getByRole("link", { name: "Bundles", exact: true }).click();
  await expect(page.getByRole("heading", { name: "Check a bundle", exact: true })).toBeVisible();

  await page.getByLabel("Bundle to check (.zip)", { exact: true }).setInputFiles({ name: "figure-1.zip", mimeType: "application/zip", buffer: bundle });
  await page.getByRole("button", { name: "Check the bundle", exact: true }).click();
  await expect(page.getByRole("status").filter({ hasText: /^✓Every one of the \d+ checks matches\.$/ })).toBeVisible({ timeout: 60_000 });
  await expect(page.getByRole("table", { name: "Bundle check" }).getByText("mismatch", { exact: true })).toHaveCount(0);
  await shoot(page, "bundle-check");

  // One byte of one raw file changed, the zip made again by hand: the check names that file.
  const files = unzipSync(new Uint8Array(bundle));
  const raw = Object.keys(files).find((p) => p.startsWith("raw/"))!;
  const changed = Uint8Array.from(files[raw]);
  changed[changed.length - 2] = changed[changed.length - 2] === 0x31 ? 0x32 : 0x31;
  const tampered = Buffer.from(zipSync({ ...files, [raw]: changed }));
  await page.getByLabel("Bundle to check (.zip)", { exact: true }).setInputFiles({ name: "tampered.zip", mimeType: "application/zip", buffer: tampered });
  await page.getByRole("button", { name: "Check the bundle", exact: true }).click();
  await expect(page.getByRole("alert").filter({ hasText: "checks do not match" })).toContainText(raw, { timeout: 60_000 });

  await page.getByLabel("Bundle to import (.zip)", { exact: true }).setInputFiles({ name: "figure-1.zip", mimeType: "application/zip", buffer: bundle });
  await page.getByRole("button", { name: "Import the bundle", exact: true }).click();
  const done = page.getByRole("status").filter({ hasText: /^✓Imported Figure \d+ with \d+ panels?/ });
  await expect(done).toBeVisible({ timeout: 90_000 });
  await expect(page.getByText(/Review decisions \(\d+\) and sign-offs \(\d+\) stay in the bundle as history/)).toBeVisible();
  await shoot(page, "bundle-import");
  await page.getByRole("link", { name: /^Open the imported Figure \d+$/ }).click();
  await expect(page.getByTestId("panel-tile-a")).toBeVisible();
  await shoot(page, "bundle-imported-figure");
});
