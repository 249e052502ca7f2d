import { expect, test } from "./fixtures";
import { DEMO_MANUSCRIPT, openDemoEchoFit, shoot, signIn } from "./helpers";

test("the author types a fit window, fits, and the stored run shows the window; points outside are drawn faded", async ({ page }) => {
  await signIn(page, "author@lab.example.org");
  await openDemoEchoFit(page);

  // Typed by keyboard: a window that runs backwards is refused in words, naming the field.
  await page.getByLabel("Fit from (µs)").fill("400");
  await page.getByLabel("Fit to (µs)").fill("2");
  await page.getByRole("button", { name: "Fit", exact: true }).click();
  await expect(page.getByRole("alert").filter({ hasText: "Fit window" })).toContainText("“Fit from” must be below “Fit to”");

  await page.getByLabel("Fit from (µs)").fill("2");
  await page.getByLabel("Fit to (µs)").fill("400");
  await page.getByRole("button", { name: "Fit", exact: true }).click();
  await expect(page.getByTestId("param-T2")).toContainText("µs");
  await expect(page.getByTestId("fit-plot-window")).toBeVisible();
  const faded = page.getByTestId("fit-plot-outside").locator("circle");
  expect(await faded.count()).toBeGreaterThan(0);
  await expect(page.getByTestId("fit-plot")).toHaveAttribute("aria-describedby", /.+/);
  await shoot(page, "fit-window");

  await page.getByRole("button", { name: "Save run" }).click();
  await expect(page.getByRole("status").filter({ hasText: "Saved — derived version" })).toBeVisible();
  const runs = page.getByRole("table", { name: "Stored runs on this version" });
  await expect(runs.getByTestId("run-window").first()).toContainText("Fit window 2 – 400 µs");

  // Refitting reuses the window: cleared, then put back from the stored run.
  await page.getByRole("button", { name: "Whole range" }).click();
  await expect(page.getByLabel("Fit from (µs)")).toHaveValue("");
  await runs.getByRole("button", { name: "Use this window" }).first().click();
  await expect(page.getByLabel("Fit from (µs)")).toHaveValue("2");
  await expect(page.getByLabel("Fit to (µs)")).toHaveValue("400");
});

test("the author fits T2 against the number of π pulses on the Analyses page", async ({ page }) => {
  await signIn(page, "author@lab.example.org");
  await page.goto(`/manuscripts/${DEMO_MANUSCRIPT}/analyses`);
  const section = page.getByRole("region", { name: "Decoupling scaling" });
  const rows = section.getByRole("table", { name: "Stored runs with a fitted T₂" }).getByRole("row");
  // The demo's echo runs have no pulse tags: choose three and type N = 1, 2, 4.
  for (let k = 0; k < 3; k++) {
    const row = rows.nth(k + 1);
    await row.getByRole("checkbox").check();
    await row.getByRole("textbox").fill(String(2 ** k));
  }
  await section.getByRole("button", { name: /^Fit T₂\(N\)/ }).click();
  await expect(section.getByTestId("scaling-result")).toBeVisible();
  await expect(section.getByTestId("scaling-exponent")).toContainText("±");
  await expect(section.getByTestId("scaling-t2-one")).toContainText("µs");
  await expect(section.getByTestId("scaling-plot")).toBeVisible();
  await expect(section.getByRole("link", { name: "Download the points (CSV)" })).toHaveAttribute("download", "t2-versus-pulses.csv");
  await shoot(page, "decoupling-scaling");
});
