import { type Locator, type Page } from "@playwright/test";
import { expect, test } from "./fixtures";
import { DEMO_MANUSCRIPT, shoot, signIn } from "./helpers";

interface ListedDataset {
  id: string;
  name: string;
  kind: string;
  tags: Record<string, string>;
  latestVersion: { id: string; number: number } | null;
}

/** Replaces text in the CodeMirror spec editor through its own search-and-replace panel, as a person would. */
async function replaceInSpec(page: Page, find: string, replace: string) {
  await page.locator(".cm-content").click();
  await page.keyboard.press("Control+f");
  const search = page.locator(".cm-search input[name=search]");
  await search.fill(find);
  await page.locator(".cm-search input[name=replace]").fill(replace);
  await page.locator(".cm-search button[name=replaceAll]").click();
  await page.locator(".cm-search button[name=close]").click();
}

async function expectRendered(chart: Locator) {
  await expect(chart.locator("svg.marks")).toBeVisible();
  await expect(chart.getByRole("alert")).toHaveCount(0);
}

test("the author builds a Hahn-echo panel with its fit, revises it twice and compares; the reviewer marks an x-range, comments and approves", async ({
  page,
  newContext,
  baseURL,
  consoleGuard,
}) => {
  test.setTimeout(240_000);
  consoleGuard.allow(/status of 409 .*\/api\/panels\/[\w-]+\/revisions$/, "the second tab saves on an old revision");
  consoleGuard.allow(/status of 400 .*\/api\/figures\/[\w-]+\/signoff$/, "signing off with a panel open first asks for a reason");
  await signIn(page, "author@lab.example.org");

  // A stored fit of one demo echo measurement, through the API as a script would run it.
  const list = await page.request.get(`/api/manuscripts/${DEMO_MANUSCRIPT}/datasets`);
  const echo = ((await list.json()) as { items: ListedDataset[] }).items.find((d) => d.kind === "hahn_echo" && !d.tags.derivedFrom && d.latestVersion)!;
  const fit = await page.request.post("/api/analyses", {
    headers: { origin: baseURL! },
    data: { versionId: echo.latestVersion!.id, model: "hahn_echo", options: { x: "tau", y: "signal", sigma: "sigma" } },
  });
  expect(fit.status()).toBe(201);

  // A new figure on the demo manuscript, double column with two columns.
  await page.goto(`/manuscripts/${DEMO_MANUSCRIPT}`);
  const form = page.getByRole("form", { name: "New figure" });
  await form.getByLabel("Title").fill("Coherence of shallow NV centres");
  await form.getByLabel("Width").selectOption("double");
  await form.getByLabel("Columns").selectOption("2");
  await form.getByRole("button", { name: "Create figure" }).click();
  await expect(page).toHaveURL(/\/figures\/[\w-]+$/);
  const figureUrl = page.url();
  await expect(page.getByRole("heading", { level: 1 })).toContainText("Coherence of shallow NV centres");

  const add = page.getByRole("form", { name: "Add panel" });
  await add.getByLabel("Panel title").fill("Hahn echo");
  await add.getByRole("button", { name: "Add panel" }).click();
  await page.getByRole("list", { name: "Panels in order" }).getByRole("link", { name: "Hahn echo" }).click();
  await expect(page).toHaveURL(/\/panels\/[\w-]+$/);
  const panelUrl = page.url();

  // Builder: the decay-curve template, the echo data and the stored fit's curve and residuals.
  const builder = page.getByTestId("builder");
  await expect(builder.getByLabel("Template")).toHaveValue("decay-curve");
  await builder.getByRole("combobox", { name: "Measured points", exact: true }).fill(echo.name);
  await builder.getByRole("option", { name: `${echo.name} · version ${echo.latestVersion!.number}`, exact: true }).click();
  await expect(builder.getByRole("combobox", { name: "Fitted curve", exact: true })).toHaveValue(/^hahn_echo fit · run /);
  await expect(builder.getByRole("combobox", { name: "Residuals", exact: true })).toHaveValue(/^hahn_echo fit · run /);
  await expect(builder.getByLabel("σ column (error bars)")).toHaveValue("sigma");
  await builder.getByLabel("Time axis", { exact: true }).selectOption("log");
  await shoot(page, "panel-builder");
  await builder.getByRole("button", { name: "Generate spec" }).click();

  // Spec editor: valid, previewed with the chosen data; an edit, then revision 1.
  await expect(page.getByRole("tab", { name: "Spec editor" })).toHaveAttribute("aria-selected", "true");
  await expect(page.getByTestId("spec-status")).toContainText("Valid Vega-Lite · data “echo”, “fit”, “residuals”");
  await expectRendered(page.getByTestId("preview"));
  await replaceInSpec(page, '"title": "Echo signal (norm)"', '"title": "echo amplitude"');
  await expect(page.getByTestId("preview").locator("svg.marks")).toContainText("echo amplitude");
  await page.getByRole("textbox", { name: "Revision note", exact: true }).fill("Echo with stretched-exponential fit; y axis named");
  await page.getByRole("button", { name: "Save revision 1" }).click();
  await expect(page.getByRole("status").filter({ hasText: "Saved revision 1" })).toBeVisible();
  const current = page.getByRole("region", { name: "Current revision" });
  await expectRendered(current);
  await expect(current).toContainText("Revision 1");
  await shoot(page, "panel-editor");

  // A second tab opened on revision 1 will be out of date once revision 2 is saved.
  const stale = await page.context().newPage();
  await stale.goto(panelUrl);
  await expect(stale.getByRole("region", { name: "Current revision" })).toContainText("Revision 1");

  // A broken edit shows inline errors (the lint marks and the list); undo takes it back. Then revision 2.
  await replaceInSpec(page, '"font": "Inter"', '"font": 7');
  await expect(page.getByTestId("spec-status")).toContainText("problems in the spec");
  await expect(page.getByTestId("spec-status")).toContainText("config.font: must be a string");
  await expect(page.locator(".cm-lintRange-error").first()).toBeAttached();
  await expect(page.getByRole("button", { name: "Save as revision 2" })).toBeDisabled();
  await shoot(page, "panel-editor-errors");
  await page.getByRole("button", { name: "Undo" }).click();
  await expect(page.getByTestId("spec-status")).toContainText("Valid Vega-Lite");
  await replaceInSpec(page, '"title": "echo amplitude"', '"title": "normalised echo"');
  await page.getByRole("textbox", { name: "Revision note", exact: true }).fill("y axis: normalised echo");
  await page.getByRole("button", { name: "Save as revision 2" }).click();
  await expect(page.getByRole("status").filter({ hasText: "Saved revision 2" })).toBeVisible();
  await expect(current).toContainText("Revision 2");

  // The other tab still edits on revision 1: the server answers 409 and the page says so plainly.
  await stale.getByRole("tab", { name: "Spec editor" }).click();
  await replaceInSpec(stale, '"title": "echo amplitude"', '"title": "amplitude"');
  await stale.getByRole("button", { name: /^Save as revision/ }).click();
  await expect(stale.getByRole("alert").filter({ hasText: "This panel changed since you opened it — reload" })).toBeVisible();
  await stale.close();

  // Revisions: the list and the comparison of 1 and 2, as changes in words, the JSON side by side on request, and two renders.
  await page.getByRole("tab", { name: "Revisions" }).click();
  const revisions = page.getByRole("table", { name: "Revisions" });
  await expect(revisions.getByRole("row")).toHaveCount(3);
  await expect(revisions).toContainText("y axis: normalised echo");
  await expect(page.getByTestId("diff-summary")).toContainText("revision 1 → 2");
  await expect(page.getByTestId("diff-summary")).toContainText("the data unchanged");
  const changes = page.getByRole("list", { name: "Changes from revision 1 to 2" });
  await expect(
    changes.getByRole("listitem").filter({ hasText: /^~?axis title of y in layers? [\d, and]+ of plot 1: "echo amplitude" → "normalised echo"$/ }),
  ).toHaveCount(1);
  await expect(page.getByTestId("spec-diff")).toHaveCount(0);
  const showJson = page.getByRole("button", { name: "Show the JSON side by side" });
  await expect(showJson).toHaveAttribute("aria-expanded", "false");
  await showJson.click();
  await expect(page.getByRole("button", { name: "Hide the JSON" })).toHaveAttribute("aria-expanded", "true");
  const diff = page.getByTestId("spec-diff");
  await expect(diff.locator('[data-kind="removed"]').filter({ hasText: "echo amplitude" }).first()).toBeVisible();
  await expect(diff.locator('[data-kind="added"]').filter({ hasText: "normalised echo" }).first()).toBeVisible();
  const renders = page.getByTestId("compare-renders").getByTestId("panel-chart");
  await expect(renders).toHaveCount(2);
  await expectRendered(renders.nth(0));
  await expectRendered(renders.nth(1));
  await expect(renders.nth(0)).toContainText("echo amplitude");
  await expect(renders.nth(1)).toContainText("normalised echo");
  await page.getByRole("heading", { name: "Compare" }).scrollIntoViewIfNeeded();
  await shoot(page, "panel-compare");

  // The figure at print size: 183 mm at 96 dpi, panel letter a; a second panel b, and reordering re-letters.
  await page.goto(figureUrl);
  await add.getByLabel("Panel title").fill("PL spectrum");
  await add.getByRole("button", { name: "Add panel" }).click();
  const order = page.getByRole("list", { name: "Panels in order" });
  await expect(order.getByRole("listitem")).toHaveText([/^a\s*Hahn echo/, /^b\s*PL spectrum/]);
  await page.getByRole("button", { name: "Move panel b up" }).click();
  await expect(order.getByRole("listitem")).toHaveText([/^a\s*PL spectrum/, /^b\s*Hahn echo/]);
  await page.getByRole("button", { name: "Move panel b up" }).click();
  await expect(order.getByRole("listitem")).toHaveText([/^a\s*Hahn echo/, /^b\s*PL spectrum/]);
  await expect(page.getByTestId("panel-tile-b")).toContainText("no revision yet");
  const tile = page.getByTestId("panel-tile-a");
  await expect(tile.getByTestId("panel-letter")).toHaveText("a");
  await expectRendered(tile);
  const sheet = await page.getByTestId("figure-sheet").boundingBox();
  expect(Math.abs(sheet!.width - (183 / 25.4) * 96)).toBeLessThan(1.5);
  await expect(page.getByTestId("zoom-level")).toHaveText("100 %");
  await shoot(page, "figure");
  await page.getByRole("button", { name: "Show the trace" }).click();
  const trace = page.getByRole("table", { name: "Trace" });
  await expect(trace).toContainText(`${echo.name} v${echo.latestVersion!.number}`);
  await expect(trace).toContainText("hahn_echo fit");
  await expect(trace.getByRole("row")).toHaveCount(5); // header, echo / fit / residuals of a, and b with no revision

  // A new panel is a draft: the author sends it to review before anyone is asked.
  await page.goto(panelUrl);
  await expect(page.getByRole("region", { name: "Draft", exact: true })).toContainText("Draft — reviewers are not asked yet");
  await page.getByRole("button", { name: "Send to review", exact: true }).click();
  await expect(page.getByRole("region", { name: "Draft", exact: true })).toHaveCount(0);

  // The reviewer marks an x-range on the plot, comments in bold, and approves.
  const reviewerContext = await newContext();
  const reviewer = await reviewerContext.newPage();
  await signIn(reviewer, "reviewer@partner.example.org");
  await reviewer.goto(panelUrl);
  const chart = reviewer.getByRole("region", { name: "Current revision" });
  await expectRendered(chart);
  await reviewer.getByRole("button", { name: "↔ Mark an x-range" }).click();
  const overlay = chart.getByTestId("pick-overlay");
  const box = (await overlay.boundingBox())!;
  await reviewer.mouse.move(box.x + box.width * 0.55, box.y + box.height * 0.5);
  await reviewer.mouse.down();
  await reviewer.mouse.move(box.x + box.width * 0.7, box.y + box.height * 0.5, { steps: 5 });
  await reviewer.mouse.move(box.x + box.width * 0.85, box.y + box.height * 0.5, { steps: 5 });
  await reviewer.mouse.up();
  await expect(reviewer.getByTestId("draft-anchor")).toContainText("x-range");
  const composer = reviewer.getByRole("textbox", { name: "New comment" });
  await composer.click();
  await reviewer.getByRole("button", { name: "Bold" }).click();
  await reviewer.keyboard.type("Tail looks flat");
  await reviewer.getByRole("button", { name: "Bold" }).click();
  await reviewer.keyboard.type(" — are there enough points beyond 1 ms?");
  await reviewer.getByRole("button", { name: "Post comment" }).click();
  const thread = reviewer.getByRole("list", { name: "Open threads" }).getByTestId("thread").first();
  await expect(thread.locator("strong", { hasText: "Tail looks flat" })).toBeVisible();
  await expect(thread.getByTestId("thread-anchor")).toContainText("x-range");
  await expect(thread).toContainText("written on revision 2 (current)");
  await expect(chart.locator("[data-anchor]")).toHaveCount(1);
  await reviewer.getByRole("button", { name: "✓ Approve revision 2" }).click();
  await expect(reviewer.getByTestId("panel-review-state")).toContainText("Approved");
  await expect(reviewer.getByRole("list", { name: "Decisions" })).toContainText("Ines Varga");
  await shoot(reviewer, "panel-review");
  await reviewerContext.close();

  // The author sees the panel approved, here and on the figure.
  await page.goto(panelUrl);
  await expect(page.getByTestId("panel-review-state")).toContainText("Approved");
  await expect(page.getByRole("list", { name: "Open threads" })).toContainText("Tail looks flat");
  await page.goto(figureUrl);
  await expect(page.getByTestId("panel-tile-a")).toContainText("Approved");

  // A new measurement version arrives; the author rebinds in one click and the approval turns stale with the data change.
  const raw = await page.request.get(`/api/versions/${echo.latestVersion!.id}/raw`);
  const remeasured = (await raw.text()).replace(/\n(\d[^,\n]*),([\d.]+)/, (_m, t: string, y: string) => `\n${t},${(Number(y) + 1e-4).toFixed(6)}`);
  const upload = await page.request.post(`/api/manuscripts/${DEMO_MANUSCRIPT}/datasets`, {
    headers: { origin: baseURL! },
    multipart: { file: { name: "echo-remeasured.csv", mimeType: "text/csv", buffer: Buffer.from(remeasured) }, datasetId: echo.id },
  });
  expect(upload.status()).toBe(201);
  const next = (await upload.json()) as { number: number };
  await page.goto(panelUrl);
  await page.getByRole("tab", { name: "Bindings" }).click();
  await page.getByRole("button", { name: `rebind to version ${next.number}` }).click();
  await expect(page.getByRole("status").filter({ hasText: "Rebound" })).toContainText("revision 3 saved");

  const again = await newContext();
  const reviewer2 = await again.newPage();
  await signIn(reviewer2, "reviewer@partner.example.org");
  await reviewer2.goto(panelUrl);
  const staleDecision = reviewer2.getByRole("list", { name: "Decisions" }).getByTestId("decision").filter({ hasText: "Stale" });
  await expect(staleDecision).toContainText(`version ${echo.latestVersion!.number} → ${next.number}`);
  await expect(reviewer2.getByTestId("panel-review-state")).toContainText("In review");
  await reviewer2.getByRole("button", { name: "✓ Approve revision 3" }).click();
  await expect(reviewer2.getByTestId("panel-review-state")).toContainText("Approved");
  await again.close();

  // The PI signs off; panel b is still open, so the sign-off asks for a reason and records it.
  const piContext = await newContext();
  const pi = await piContext.newPage();
  await signIn(pi, "pi@lab.example.org");
  await pi.goto(figureUrl);
  const panelB = await pi.request.get(`/api/figures/${figureUrl.split("/").pop()}`);
  const b = ((await panelB.json()) as { panels: Array<{ id: string; letter: string }> }).panels.find((p) => p.letter === "b")!;
  const specA = ((await (await pi.request.get(`/api/panels/${panelUrl.split("/").pop()}`)).json()) as { currentRevision: { spec: unknown; bindings: unknown } })
    .currentRevision;
  expect(
    (
      await page.request.post(`/api/panels/${b.id}/revisions`, {
        headers: { origin: baseURL! },
        data: { spec: specA.spec, bindings: specA.bindings, baseRevisionId: null, message: "draft" },
      })
    ).status(),
  ).toBe(201);
  await pi.reload();

  // Every panel has a revision now, so the vector PDF downloads from the figure page.
  const pdfHref = await pi.getByRole("link", { name: "PDF (vector, fonts embedded)", exact: true }).getAttribute("href");
  const pdf = await pi.request.get(pdfHref!);
  expect(pdf.status()).toBe(200);
  expect(pdf.headers()["content-type"]).toBe("application/pdf");
  expect((await pdf.body()).subarray(0, 5).toString()).toBe("%PDF-");

  await pi.getByRole("button", { name: "Sign off this figure" }).click();
  await pi.getByLabel("Reason for signing off with open issues").fill("Panel b is a supplementary view; the reviewer saw it in the meeting.");
  await pi.getByRole("button", { name: "Sign off with this reason" }).click();
  await expect(pi.getByRole("list", { name: "Sign-offs" })).toContainText("Mira Halvorsen");
  await expect(pi.getByRole("list", { name: "Sign-offs" })).toContainText("Reason:");
  await shoot(pi, "figure-signed-off");
  await piContext.close();
});
