import { expect, test } from "./fixtures";
import { DEMO_MANUSCRIPT, shoot, signIn } from "./helpers";

test("the author sets the manuscript's house style through the form; the figure page and a greyscale TIFF follow it; back to the defaults", async ({
  page,
}) => {
  test.setTimeout(120_000);
  await signIn(page, "author@lab.example.org");
  await page.goto(`/manuscripts/${DEMO_MANUSCRIPT}`);
  await page.getByRole("link", { name: "House style", exact: true }).click();
  await expect(page.getByRole("heading", { name: "House style", exact: true })).toBeVisible();
  await expect(page.getByTestId("house-style-summary")).toHaveText("In use: Inter, labels 7 pt, titles 8 pt, axes 0.6 pt, letters a 8 pt bold");

  const form = page.getByRole("form", { name: "House style" });
  await form.getByLabel("Font", { exact: true }).selectOption({ label: "Arimo (the metrics of Arial and Helvetica)" });
  // 4 pt is below what journals print: the field itself refuses it before anything is sent.
  const labels = form.getByLabel("Tick and legend labels (pt)", { exact: true });
  await labels.fill("4");
  await form.getByRole("button", { name: "Save house style", exact: true }).click();
  expect(await labels.evaluate((e: HTMLInputElement) => e.validity.rangeUnderflow)).toBe(true);
  await expect(page.getByTestId("house-style-summary")).toContainText("Inter, labels 7 pt");

  await labels.fill("6");
  await form.getByLabel("Axis titles (pt)", { exact: true }).fill("7");
  await form.getByLabel("Panel letters", { exact: true }).selectOption({ label: "capitals (A, B)" });
  await form.getByLabel("Letter weight", { exact: true }).selectOption({ label: "regular" });
  await form.getByRole("button", { name: "Save house style", exact: true }).click();
  await expect(form.getByRole("status")).toContainText("Saved.");
  await expect(page.getByTestId("house-style-summary")).toHaveText("In use: Arimo, labels 6 pt, titles 7 pt, axes 0.6 pt, letters A 8 pt normal");
  await shoot(page, "house-style");

  // The figure page draws its letters as the style says and names the style beside the downloads.
  await page.goto(`/manuscripts/${DEMO_MANUSCRIPT}`);
  await page
    .getByRole("link", { name: /^Figure 1\b/ })
    .first()
    .click();
  await expect(page.getByTestId("panel-tile-a").getByTestId("panel-letter")).toHaveText("A");
  await expect(page.getByText("House style: Arimo, labels 6 pt, titles 7 pt, axes 0.6 pt, letters A 8 pt normal")).toBeVisible();

  await page.getByLabel("Resolution", { exact: true }).selectOption({ label: "600 dpi (combination art)" });
  await page.getByLabel("Colour", { exact: true }).selectOption({ label: "Greyscale" });
  const [download] = await Promise.all([page.waitForEvent("download"), page.getByRole("link", { name: "TIFF (LZW)", exact: true }).click()]);
  expect(download.suggestedFilename()).toBe("figure-1.600dpi-grey.tif");
  const bytes = await (await download.createReadStream()).toArray();
  const head = Buffer.concat(bytes).subarray(0, 4);
  expect(["49492a00", "4d4d002a"]).toContain(head.toString("hex")); // "II*\0" or "MM\0*": a TIFF (TIFF 6.0 §2)
  await shoot(page, "figure-export-house-style");

  // Back to the defaults, so the demo figures look as they did.
  await page.goto(`/manuscripts/${DEMO_MANUSCRIPT}/house-style`);
  await form.getByRole("button", { name: "Back to the defaults", exact: true }).click();
  await form.getByRole("button", { name: "Save house style", exact: true }).click();
  await expect(page.getByTestId("house-style-summary")).toHaveText("In use: Inter, labels 7 pt, titles 8 pt, axes 0.6 pt, letters a 8 pt bold");
});
