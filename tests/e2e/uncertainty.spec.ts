import { expect, test } from "./fixtures";
import { DEMO_MANUSCRIPT, shoot, signIn } from "./helpers";

interface ListedDataset {
  id: string;
  name: string;
  latestVersion: { id: string } | null;
}

test("the author asks for bootstrap intervals, watches the draws, and saves them with the run", async ({ page }) => {
  await signIn(page, "author@lab.example.org");
  const res = await page.request.get(`/api/manuscripts/${DEMO_MANUSCRIPT}/datasets`);
  const { items } = (await res.json()) as { items: ListedDataset[] };
  const echo = items.find((d) => d.name === "Hahn echo, NV03 (sample K17)" && d.latestVersion)!;
  await page.goto(`/versions/${echo.latestVersion!.id}/fit`);
  await page.getByLabel("Model").selectOption("hahn_echo");

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
