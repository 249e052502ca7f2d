import { expect, test } from "./fixtures";
import { DEMO_MANUSCRIPT, shoot, signIn } from "./helpers";

test("the author fits the CPMG series of one centre together, sharing S0 and A", async ({ page }) => {
  await signIn(page, "author@lab.example.org");
  // From one curve's fit page to the global fit over the series.
  const res = await page.request.get(`/api/manuscripts/${DEMO_MANUSCRIPT}/datasets`);
  const { items } = (await res.json()) as { items: Array<{ kind: string; latestVersion: { id: string } | null }> };
  const cpmg = items.find((d) => d.kind === "decoupling" && d.latestVersion)!;
  await page.goto(`/versions/${cpmg.latestVersion!.id}/fit`);
  await page.getByRole("link", { name: "Global fit over several datasets" }).click();
  await expect(page).toHaveURL(/\/analyses#global-fit$/);
  const section = page.getByRole("region", { name: "Global fit" });
  await section.getByLabel("Measurement kind for the global fit").selectOption("decoupling");
  await section.getByLabel("Model for the global fit").selectOption("hahn_echo");
  await section.getByLabel("σ column").selectOption("sigma");
  // The echo's offset and amplitude are shared by default; T2 and n are fitted per curve.
  await expect(section.getByLabel("Share S0")).toBeChecked();
  await expect(section.getByLabel("Share A")).toBeChecked();
  await expect(section.getByLabel("Share T2")).not.toBeChecked();

  // Holding a shared parameter fixed is refused in words before anything is sent.
  await section.getByLabel("Hold A fixed at").fill("0.47");
  await section.getByRole("button", { name: "Fit 3 datasets together" }).click();
  await expect(section.getByRole("alert")).toContainText("A is both shared and held fixed: choose one.");
  await section.getByLabel("Hold A fixed at").fill("");

  await section.getByRole("button", { name: "Fit 3 datasets together" }).click();
  const shared = section.getByRole("table", { name: "Shared parameters" });
  await expect(shared.getByTestId("shared-S0")).toContainText("±");
  await expect(shared.getByTestId("shared-A")).toContainText("norm");
  const perDataset = section.getByRole("table", { name: "Parameters per dataset" });
  await expect(perDataset.getByRole("row")).toHaveCount(4);
  await expect(perDataset.getByRole("columnheader", { name: "T2 (µs)" })).toBeVisible();
  await expect(section.getByTestId("fit-plot")).toHaveCount(3);
  await shoot(page, "global-fit");
});
