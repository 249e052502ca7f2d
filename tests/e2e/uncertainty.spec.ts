import { expect, test } from "./fixtures";
import { openDemoEchoFit, shoot, signIn } from "./helpers";

test("the author asks for bootstrap intervals, watches the draws, and saves them with the run", async ({ page }) => {
  await signIn(page, "author@lab.example.org");
  await openDemoEchoFit(page);

  await page.getByLabel("Bootstrap intervals as well").check();
  await page.getByLabel("Bootstrap draws").fill("50");
  await page.getByRole("button", { name: "Fit", exact: true }).click();
  await expect(page.getByRole("alert").filter({ hasText: "Bootstrap draws" })).toContainText("give a whole number from 100 to 5000");

  await page.getByLabel("Bootstrap draws").fill("1000");
  await page.getByRole("button", { name: "Fit", exact: true }).click();
  await expect(page.getByRole("progressbar", { name: "Bootstrap progress" })).toBeVisible();
  const table = page.getByRole("table", { name: "Bootstrap intervals" });
  await expect(table).toBeVisible({ timeout: 60_000 });
  await expect(table.getByTestId("bootstrap-T2")).toContainText("µs");
  await expect(table.getByTestId("bootstrap-T2")).toContainText("× — they agree");
  await expect(page.getByText(/residual bootstrap, 1000 draws, seed 1/)).toBeVisible();
  await shoot(page, "fit-bootstrap");

  await page.getByRole("button", { name: "Save run" }).click();
  await expect(page.getByRole("status").filter({ hasText: "Saved — derived version" })).toBeVisible({ timeout: 60_000 });
});

test("the author compares the echo with n free, n = 1 and n = 2 and sees which the data support", async ({ page }) => {
  await signIn(page, "author@lab.example.org");
  await openDemoEchoFit(page);

  const compare = page.getByRole("region", { name: "Compare fits" });
  await expect(compare.getByLabel("Candidate 1", { exact: true })).toHaveValue("hahn_echo");
  // The second candidate starts as the same echo with n held at 1.
  await expect(compare.getByLabel("Hold fixed (candidate 2)")).toHaveValue("n");
  await expect(compare.getByLabel("n held at (candidate 2)")).toHaveValue("1");
  await compare.getByRole("button", { name: "Add candidate" }).click();
  await compare.getByLabel("Hold fixed (candidate 3)").selectOption("n");
  await compare.getByRole("button", { name: "Compare" }).click();
  await expect(compare.getByRole("alert")).toContainText("Candidate 3: give the value n is held at");
  await compare.getByLabel("n held at (candidate 3)").fill("2");
  await compare.getByRole("button", { name: "Compare" }).click();

  const verdict = compare.getByTestId("comparison-verdict");
  await expect(verdict).toContainText("Preferred:", { timeout: 30_000 });
  const ranked = compare.getByRole("table", { name: "Candidates ranked" });
  await expect(ranked.getByRole("row")).toHaveCount(4);
  await expect(ranked).toContainText("n = 1 (held)");
  await expect(compare.getByRole("table", { name: "F-tests of nested candidates" }).getByRole("row")).toHaveCount(3);
  await expect(compare.getByRole("img", { name: /^Residuals of / })).toHaveCount(3);
  await shoot(page, "fit-model-comparison");
});
