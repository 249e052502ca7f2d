import { expect, test } from "./fixtures";
import { shoot, signIn } from "./helpers";

test("calculators: ODMR pair → field, with the caution and assumptions", async ({ page, consoleGuard }) => {
  consoleGuard.allow(/status of 400 .*\/api\/calculators\/odmr-field-from-pair$/, "a negative resonance is refused by the server");
  await signIn(page, "reviewer@partner.example.org");
  await page.getByRole("link", { name: "Calculators" }).click();
  await expect(page.getByText("An estimate, not a calibration.").first()).toBeVisible();
  const card = page.getByRole("region", { name: "ODMR resonances → axial field and D" });
  await card.getByLabel(/Lower resonance/).fill("2750");
  await card.getByLabel(/Upper resonance/).fill("2990");
  await card.getByRole("button", { name: "Calculate" }).click();
  // f₋ = 2750 MHz, f₊ = 2990 MHz → B = (f₊ − f₋)/(2γ_NV) = 240/(2 × 28.0317 MHz/mT) = 4.2809 mT,
  // D = (f₊ + f₋)/2 = 2870 MHz (γ_NV = gμB/h, g = 2.0028 from memory, CODATA 2018 μB and h).
  const field = Number(/([\d.]+) mT/.exec((await card.getByTestId("result-odmr-field-from-pair").textContent()) ?? "")?.[1]);
  expect(Math.abs(field - 4.2809)).toBeLessThan(5e-5);
  await expect(card.getByTestId("result-odmr-field-from-pair")).toContainText("2870 MHz");
  await card.getByLabel(/Lower resonance/).fill("-5");
  await card.getByRole("button", { name: "Calculate" }).click();
  await expect(card.getByRole("alert")).toContainText("f_minus");
  await shoot(page, "calculators");
});
