import { expect, test } from "./fixtures";
import { DEMO_MANUSCRIPT, shoot, signIn } from "./helpers";

interface ListedDataset {
  id: string;
  name: string;
  kind: string;
  tags: Record<string, string>;
  latestVersion: { id: string; number: number } | null;
}

test("the author finds new data by its sample, fits it from the builder, shows T₂ in the plot and saves; the reviewer reads the run's parameters", async ({
  page,
  newContext,
  baseURL,
}) => {
  test.setTimeout(180_000);
  await signIn(page, "author@lab.example.org");
  const headers = { origin: baseURL! };

  // A new measurement nobody has fitted yet: a demo echo with one value nudged, under a sample name of its own.
  const list = await page.request.get(`/api/manuscripts/${DEMO_MANUSCRIPT}/datasets`);
  const echo = ((await list.json()) as { items: ListedDataset[] }).items.find((d) => d.kind === "hahn_echo" && !d.tags.derivedFrom && d.latestVersion)!;
  const raw = await (await page.request.get(`/api/versions/${echo.latestVersion!.id}/raw`)).text();
  const stamp = Date.now().toString(36);
  const nudged = raw.replace(/\n(\d[^,\n]*),([\d.]+)/, (_m, t: string, y: string) => `\n${t},${(Number(y) + 1e-5).toFixed(6)}`);
  const name = `Journey echo ${stamp}`;
  const sample = `NV-J${stamp}`;
  const upload = await page.request.post(`/api/manuscripts/${DEMO_MANUSCRIPT}/datasets`, {
    headers,
    multipart: {
      file: { name: "journey-echo.csv", mimeType: "text/csv", buffer: Buffer.from(nudged) },
      name,
      metadata: JSON.stringify({ kind: "hahn_echo", sample }),
    },
  });
  expect(upload.status()).toBe(201);

  // A figure with one empty panel.
  const figure = await page.request.post("/api/figures", { headers, data: { manuscriptId: DEMO_MANUSCRIPT, title: "Builder journey" } });
  expect(figure.status()).toBe(201);
  const panel = await page.request.post(`/api/figures/${((await figure.json()) as { id: string }).id}/panels`, { headers, data: { title: "Echo" } });
  expect(panel.status()).toBe(201);
  const panelId = ((await panel.json()) as { id: string }).id;
  await page.goto(`/panels/${panelId}`);

  // Searching the measured-data picker by sample finds the one version, grouped under its dataset.
  const builder = page.getByTestId("builder");
  const measured = builder.getByRole("combobox", { name: "Measured points", exact: true });
  await measured.fill(sample);
  const choices = builder.getByRole("listbox", { name: "Measured points: choices", exact: true });
  await expect(choices.getByRole("group", { name, exact: true })).toBeVisible();
  await expect(choices.getByRole("option")).toHaveCount(1);
  await shoot(page, "builder-picker-search");
  await measured.press("Enter");
  await expect(measured).toHaveValue(`${name} · version 1`);

  // No stored fit yet: the builder offers to fit this version, and the fit page leads back with the new run chosen.
  await builder.getByRole("link", { name: "Fit this version", exact: true }).click();
  await expect(page).toHaveURL(/\/versions\/[\w-]+\/fit\?returnTo=/);
  await page.getByLabel("Model").selectOption("hahn_echo");
  await page.getByRole("button", { name: "Fit", exact: true }).click();
  await expect(page.getByRole("button", { name: "Save run" })).toBeEnabled();
  await page.getByRole("button", { name: "Save run" }).click();
  await page.getByRole("link", { name: "Back to the panel", exact: true }).click();
  await expect(page).toHaveURL(/\/panels\/[\w-]+\?.*bind=/);
  const runId = new URL(page.url()).searchParams.get("bind")!;
  await expect(page.getByRole("tab", { name: "Builder" })).toHaveAttribute("aria-selected", "true");
  await expect(measured).toHaveValue(`${name} · version 1`);
  await expect(builder.getByRole("combobox", { name: "Fitted curve", exact: true })).toHaveValue(new RegExp(`^hahn_echo fit · run .* · ${runId.slice(0, 6)}$`));

  // The fitted T₂ written in the plot, from the run: parameter and corner chosen in the builder.
  await builder.getByRole("checkbox", { name: "Show fitted value", exact: true }).check();
  await builder.getByRole("combobox", { name: "Parameter", exact: true }).selectOption("T2");
  await builder.getByRole("combobox", { name: "Position", exact: true }).selectOption("top-left");
  const previewText = /T₂ = \d+(\.\d+)? ± \d+(\.\d+)? µs/;
  await expect(builder.getByTestId("builder-preview").locator("svg.marks")).toContainText(previewText);
  await shoot(page, "builder-fitted-value");
  const save = page.getByRole("form", { name: "Save from the builder", exact: true });
  await save.getByRole("textbox", { name: "What changed (revision note)", exact: true }).fill("Echo with its fit and T₂");
  await save.getByRole("button", { name: "Save revision 1", exact: true }).click();
  const current = page.getByRole("region", { name: "Current revision", exact: true });
  await expect(current).toContainText("Revision 1");
  await expect(current.locator("svg.marks")).toContainText(previewText);

  // The reviewer reads the bound run's parameters beside the plot.
  const other = await newContext();
  const reviewer = await other.newPage();
  await signIn(reviewer, "reviewer@partner.example.org");
  await reviewer.goto(`/panels/${panelId}`);
  const params = reviewer.getByRole("region", { name: "Fitted parameters of the bound runs", exact: true });
  const table = params.getByRole("table", { name: `Parameters of the hahn_echo fit ${runId.slice(0, 6)}`, exact: true });
  await expect(table.getByRole("columnheader")).toHaveText(["Parameter", "Value ± uncertainty", "Unit", "Model"]);
  const t2 = table.getByRole("row").filter({ has: reviewer.getByRole("rowheader", { name: "T₂", exact: true }) });
  await expect(t2.getByRole("cell")).toHaveText([/^\d+(\.\d+)? ± \d+(\.\d+)?$/, "µs", "hahn_echo"]);
  await shoot(reviewer, "panel-run-parameters");
});
