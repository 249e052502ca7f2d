import { expect, test } from "./fixtures";
import { DEMO_MANUSCRIPT, shoot, signIn } from "./helpers";

interface ListedDataset {
  kind: string;
  tags: Record<string, string>;
  latestVersion: { id: string } | null;
}

/**
 * The whole journey of a figure, through visible labels only (no spec editor, no JSON): the author
 * uploads a measurement, fits it, builds a two-panel figure and sends it to review; the reviewer
 * asks for a change; the author makes it in the builder; the reviewer approves; the PI signs off;
 * the export carries no draft mark and the changed axis name.
 */
test("upload, fit, build two panels, take a reviewer's change, re-approve, sign off and export — without touching JSON", async ({ page, newContext }) => {
  test.setTimeout(300_000);
  await signIn(page, "author@lab.example.org");

  // A measurement file of our own: a demo echo with one value nudged (so its hash is new), under a new sample name.
  const list = await page.request.get(`/api/manuscripts/${DEMO_MANUSCRIPT}/datasets`);
  const echo = ((await list.json()) as { items: ListedDataset[] }).items.find((d) => d.kind === "hahn_echo" && !d.tags.derivedFrom && d.latestVersion)!;
  const raw = await (await page.request.get(`/api/versions/${echo.latestVersion!.id}/raw`)).text();
  const stamp = Date.now().toString(36);
  const sample = `NV-W${stamp}`;
  const csv = raw.replace(/\n(\d[^,\n]*),([\d.]+)/, (_m, t: string, y: string) => `\n${t},${(Number(y) + 2e-5).toFixed(6)}`);

  // 1. Upload on the Data page.
  await page.goto(`/manuscripts/${DEMO_MANUSCRIPT}`);
  await page.getByRole("link", { name: /\d+ datasets/ }).click();
  await page.getByLabel("Measurement kind").selectOption("hahn_echo");
  await page.getByLabel("Sample", { exact: true }).fill(sample);
  const fileName = `journey-${stamp}.csv`;
  await page.getByTestId("upload-input").setInputFiles([{ name: fileName, mimeType: "text/csv", buffer: Buffer.from(csv) }]);
  await expect(page.getByRole("list", { name: "Uploads" }).getByRole("listitem").filter({ hasText: fileName })).toContainText(/✓ stored as version 1/);

  // 2. A two-column figure with two panels.
  await page.goto(`/manuscripts/${DEMO_MANUSCRIPT}`);
  const newFigure = page.getByRole("form", { name: "New figure", exact: true });
  await newFigure.getByLabel("Title", { exact: true }).fill(`Echo of ${sample}`);
  await newFigure.getByLabel("Width", { exact: true }).selectOption({ label: "Double column · 183 mm" });
  await newFigure.getByLabel("Columns", { exact: true }).selectOption("2");
  await newFigure.getByRole("button", { name: "Create figure", exact: true }).click();
  await expect(page).toHaveURL(/\/figures\/[\w-]+$/);
  const figureUrl = page.url();
  const add = page.getByRole("form", { name: "Add panel", exact: true });
  for (const title of ["Echo and fit", "Echo, linear time"]) {
    await add.getByLabel("Panel title").fill(title);
    await add.getByRole("button", { name: "Add panel", exact: true }).click();
    await expect(page.getByRole("list", { name: "Panels in order" })).toContainText(title);
  }

  // 3. Panel a: the measured points found by sample, fitted from the builder, saved, sent to review.
  await page.getByRole("link", { name: "Panel a: Echo and fit", exact: true }).click();
  const builder = page.getByTestId("builder");
  const measured = builder.getByRole("combobox", { name: "Measured points", exact: true });
  await measured.fill(sample);
  await expect(builder.getByRole("listbox", { name: "Measured points: choices", exact: true }).getByRole("option")).toHaveCount(1);
  await measured.press("Enter");
  await expect(measured).toHaveValue(new RegExp(`· version 1$`));
  await builder.getByRole("link", { name: "Fit this version", exact: true }).click();
  await page.getByLabel("Model").selectOption("hahn_echo");
  await page.getByRole("button", { name: "Fit", exact: true }).click();
  await page.getByRole("button", { name: "Save run" }).click();
  await page.getByRole("link", { name: "Back to the panel", exact: true }).click();
  await expect(builder.getByRole("combobox", { name: "Fitted curve", exact: true })).toHaveValue(/^hahn_echo fit · run /);
  // The template follows the data: a log time axis for an echo, the axis names and units from the file's columns.
  await expect(builder.getByLabel("Time axis", { exact: true })).toHaveValue("log");
  await expect(builder.getByTestId("builder-preview").locator("svg.marks")).toContainText("Echo signal (norm)");
  const saveA = page.getByRole("form", { name: "Save from the builder", exact: true });
  await saveA.getByRole("textbox", { name: "What changed (revision note)", exact: true }).fill("Echo with its fit");
  await saveA.getByRole("button", { name: "Save revision 1", exact: true }).click();
  await expect(page.getByRole("region", { name: "Current revision", exact: true })).toContainText("Revision 1");
  await page.getByRole("button", { name: "Send to review", exact: true }).click();
  await expect(page.getByText("Sent to review: the reviewers are asked.")).toBeVisible();
  const panelAUrl = page.url().split("?")[0]!;

  // 4. Panel b: the same points on a linear time axis, saved, sent to review.
  await page.goto(figureUrl);
  await page.getByRole("link", { name: "Panel b: Echo, linear time", exact: true }).click();
  // Both pickers searched by the sample name: the one version, then its one stored run (beside "(none)").
  for (const [picker, choice] of [
    ["Measured points", /· version 1/],
    ["Fitted curve", /hahn_echo fit · run /],
  ] as const) {
    await builder.getByRole("combobox", { name: picker, exact: true }).fill(sample);
    const choices = builder.getByRole("listbox", { name: `${picker}: choices`, exact: true });
    // The stored runs load after the measured points are chosen; on a busy machine that takes a while.
    await expect(choices.getByRole("option", { name: choice })).toHaveCount(1, { timeout: 30_000 });
    await choices.getByRole("option", { name: choice }).click();
  }
  await expect(builder.getByRole("combobox", { name: "Fitted curve", exact: true })).toHaveValue(/^hahn_echo fit · run /);
  await builder.getByLabel("Time axis", { exact: true }).selectOption({ label: "linear" });
  const saveB = page.getByRole("form", { name: "Save from the builder", exact: true });
  await saveB.getByRole("textbox", { name: "What changed (revision note)", exact: true }).fill("Linear time");
  await saveB.getByRole("button", { name: "Save revision 1", exact: true }).click();
  await expect(page.getByRole("region", { name: "Current revision", exact: true })).toContainText("Revision 1");
  await page.getByRole("button", { name: "Send to review", exact: true }).click();
  await expect(page.getByText("Sent to review: the reviewers are asked.")).toBeVisible();
  const panelBUrl = page.url().split("?")[0]!;
  await shoot(page, "journey-panel-b");

  // 5. The reviewer asks for a change on a and approves b.
  const reviewer = await (await newContext()).newPage();
  await signIn(reviewer, "reviewer@partner.example.org");
  await reviewer.goto(panelAUrl);
  await reviewer.getByRole("button", { name: "✕ Needs revision", exact: true }).click();
  await reviewer.getByLabel("What needs to change", { exact: true }).fill("Name the signal axis “echo amplitude”.");
  await reviewer.getByRole("button", { name: "Send: needs revision", exact: true }).click();
  await expect(reviewer.getByText("Your decision on revision 1:")).toContainText("needs revision");
  await reviewer.goto(panelBUrl);
  await reviewer.getByRole("button", { name: "✓ Approve revision 1", exact: true }).click();
  await expect(reviewer.getByText("Your decision on revision 1:")).toContainText("approved");

  // 6. The author makes the change in the builder, which opens on the panel's current revision.
  await page.goto(panelAUrl);
  await page.getByRole("tab", { name: "Builder", exact: true }).click();
  await expect(builder.getByLabel("Time axis", { exact: true })).toHaveValue("log");
  await builder.getByLabel("Signal axis name", { exact: true }).fill("echo amplitude");
  await expect(builder.getByTestId("builder-preview").locator("svg.marks")).toContainText("echo amplitude");
  await saveA.getByRole("textbox", { name: "What changed (revision note)", exact: true }).fill("Signal axis named as asked");
  await saveA.getByRole("button", { name: "Save as revision 2", exact: true }).click();
  await expect(page.getByRole("region", { name: "Current revision", exact: true })).toContainText("Revision 2");
  await shoot(page, "journey-panel-a-revised");

  // 7. The reviewer sees the change and approves revision 2.
  await reviewer.goto(panelAUrl);
  await reviewer.getByRole("button", { name: "✓ Approve revision 2", exact: true }).click();
  await expect(reviewer.getByText("Your decision on revision 2:")).toContainText("approved");

  // 8. The PI signs off: no open issues, so no reason is asked.
  const pi = await (await newContext()).newPage();
  await signIn(pi, "pi@lab.example.org");
  await pi.goto(figureUrl);
  await pi.getByRole("button", { name: "Sign off this figure", exact: true }).click();
  await expect(pi.getByText(/^Signed off hash [0-9a-f]{12}/)).toBeVisible();
  await pi.reload();
  await expect(pi.getByText("Signed off on this figure hash: exports carry no draft mark.")).toBeVisible();
  for (const letter of ["a", "b"]) await expect(pi.getByTestId(`panel-tile-${letter}`).locator("svg.marks")).toBeVisible();
  await shoot(pi, "journey-signed-off");

  // 9. The export: no draft mark, the reviewer's axis name, the figure's own size.
  const [download] = await Promise.all([
    pi.waitForEvent("download"),
    pi.getByRole("link", { name: "SVG, editable text with the fonts embedded", exact: true }).click(),
  ]);
  const svg = Buffer.concat(await (await download.createReadStream()).toArray()).toString("utf8");
  expect(svg).toMatch(/^<svg[^>]*width="183mm"/);
  expect(svg).toContain(">echo amplitude");
  expect(svg).not.toContain("Not signed off");
  const [pdf] = await Promise.all([pi.waitForEvent("download"), pi.getByRole("link", { name: "PDF (vector, fonts embedded)", exact: true }).click()]);
  expect(
    Buffer.concat(await (await pdf.createReadStream()).toArray())
      .subarray(0, 5)
      .toString("latin1"),
  ).toBe("%PDF-");
});
