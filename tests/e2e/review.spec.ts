import { type Page } from "@playwright/test";
import { expect, test } from "./fixtures";
import { api, DEMO_MANUSCRIPT, shoot, signIn } from "./helpers";

const SPEC = {
  $schema: "https://vega.github.io/schema/vega-lite/v6.json",
  data: { name: "echo" },
  mark: "point",
  // Titled with units, so the print check lets the PI sign off figure A without a reason.
  encoding: { x: { field: "tau", type: "quantitative", title: "τ (µs)" }, y: { field: "signal", type: "quantitative", title: "signal (norm.)" } },
};
const HOSTILE = '<img src=x onerror="window.__xss=1">';
const doc = (text: string) => ({ type: "doc", content: [{ type: "paragraph", content: [{ type: "text", text }] }] });

interface Scene {
  figureId: string;
  number: number;
  panelId: string;
  revisionId: string;
}
const scene: { a?: Scene; b?: Scene; versionId?: string } = {};

async function figureWithPanel(page: Page, title: string, versionId: string): Promise<Scene> {
  const call = api(page);
  const figure = await call.post("/api/figures", { manuscriptId: DEMO_MANUSCRIPT, title });
  const panel = await call.post(`/api/figures/${figure.id}/panels`, { title: "Hahn echo" });
  const revision = await call.post(`/api/panels/${panel.id}/revisions`, {
    spec: SPEC,
    bindings: { echo: { versionId } },
    baseRevisionId: null,
    message: "first draft",
  });
  const patched = await call.patch(`/api/figures/${figure.id}`, { requiredReviewers: ["demo-reviewer"] });
  expect(patched.requiredReviewers).toEqual(["demo-reviewer"]);
  await call.post(`/api/panels/${panel.id}/send-to-review`, undefined, 200);
  return { figureId: figure.id, number: figure.number, panelId: panel.id, revisionId: revision.id };
}

const row = (page: Page, s: Scene) => page.getByRole("row").filter({ has: page.getByRole("cell", { name: `Figure ${s.number}`, exact: true }) });
const figureRow = (page: Page, s: Scene) => page.getByTestId(`figure-row-${s.number}`);

test.describe.serial("review: queue, figure status, activity and sign-off", () => {
  test("the author drafts two figures bound to a Hahn-echo version and names the reviewer", async ({ page }) => {
    await signIn(page, "author@lab.example.org");
    const { items } = (await api(page).get(`/api/manuscripts/${DEMO_MANUSCRIPT}/datasets`)) as {
      items: Array<{ kind: string; tags: Record<string, string>; latestVersion: { id: string } | null }>;
    };
    const echo = items.find((d) => d.kind === "hahn_echo" && !d.tags.derivedFrom && d.latestVersion);
    expect(echo, "a demo Hahn-echo dataset").toBeTruthy();
    scene.versionId = echo!.latestVersion!.id;
    scene.a = await figureWithPanel(page, "Coherence of shallow NV centres", scene.versionId);
    scene.b = await figureWithPanel(page, "Echo decay after annealing", scene.versionId);
  });

  test("the reviewer finds both panels waiting, sorts and filters, then decides", async ({ page }) => {
    const { a, b } = scene as Required<typeof scene>;
    await signIn(page, "reviewer@partner.example.org");
    await expect(page.getByTestId("waiting-count")).toContainText(/\d/);
    await page.getByRole("link", { name: /^Waiting on me/ }).click();
    await expect(page.getByRole("heading", { level: 1, name: "Waiting on me" })).toBeVisible();
    for (const s of [a, b]) {
      const r = row(page, s);
      await expect(r.getByRole("link", { name: "review panel a (revision 1)" })).toHaveAttribute("href", `/panels/${s.panelId}`);
      await expect(r).toContainText("◐In review");
      await expect(r.locator("time")).toHaveAttribute("title", /UTC$/);
    }

    await page.getByRole("button", { name: "Figure" }).click();
    await expect(page.getByRole("columnheader", { name: "Figure" })).toHaveAttribute("aria-sort", "ascending");
    await page.getByRole("button", { name: "Figure" }).click();
    await expect(page.getByRole("columnheader", { name: "Figure" })).toHaveAttribute("aria-sort", "descending");
    const firstWhat = page.getByRole("row").nth(1);
    await expect(firstWhat).toContainText(`Figure ${Math.max(a.number, b.number)}`);

    await page.getByLabel("Kind").selectOption("signoff");
    await expect(page.getByText("Nothing matches these filters.")).toBeVisible();
    await page.getByLabel("Kind").selectOption("review");
    await page.getByLabel("Filter").fill("annealing");
    await expect(row(page, b)).toBeVisible();
    await expect(row(page, a)).toHaveCount(0);
    await page.getByLabel("Filter").fill("");
    await expect(row(page, a)).toBeVisible();
    await shoot(page, "review-queue");

    const call = api(page);
    await call.post(`/api/panels/${a.panelId}/approvals`, { revisionId: a.revisionId, decision: "approved", note: "T2 fit looks right" });
    await call.post(`/api/panels/${b.panelId}/approvals`, { revisionId: b.revisionId, decision: "needs_revision", note: "axis title lacks units" });
    await page.reload();
    await expect(row(page, a)).toHaveCount(0);
    await expect(row(page, b)).toHaveCount(0);
  });

  test("the PI sees the sign-off waiting, reads the figure status and the activity, and signs off", async ({ page, consoleGuard }) => {
    consoleGuard.allow(/status of 409 .*\/api\/figures\/[\w-]+\/signoff$/, "figure B changes while the PI looks at it");
    consoleGuard.allow(/status of 400 .*\/api\/figures\/[\w-]+\/signoff$/, "open issues ask for a reason first");
    const { a, b, versionId } = scene as Required<typeof scene>;
    await signIn(page, "pi@lab.example.org");
    await page.goto("/review");
    await page.getByLabel("Kind").selectOption("signoff");
    const signRow = row(page, a);
    await expect(signRow.getByRole("link", { name: `sign off figure ${a.number}` })).toHaveAttribute("href", `/figures/${a.figureId}`);
    await expect(signRow).toContainText("✓Approved");
    await expect(row(page, b)).toHaveCount(0);
    await signRow.getByRole("link", { name: /Coherence and proton NMR/ }).click();

    await expect(page).toHaveURL(new RegExp(`/manuscripts/${DEMO_MANUSCRIPT}/status$`));
    await expect(page.getByRole("heading", { level: 1, name: "Figure status" })).toBeVisible();
    await expect(page.getByRole("definition").filter({ hasText: "the PI signed off this exact version" })).toBeVisible();
    const rowA = figureRow(page, a);
    const rowB = figureRow(page, b);
    await expect(rowA.getByTestId("panel-cell-a")).toContainText("✓Approved");
    await expect(rowA.getByTestId("panel-cell-a").getByTestId("approved-by")).toContainText("Ines Varga");
    await expect(rowA.getByTestId("panel-cell-a").getByTestId("waiting-on")).toContainText("—");
    await expect(rowB.getByTestId("panel-cell-a")).toContainText("✕Needs revision");
    await expect(rowB.getByTestId("panel-cell-a")).toContainText("Asked for changesInes Varga");
    await expect(rowB.getByTestId("panel-cell-a").getByTestId("waiting-on")).toContainText("Ines Varga");
    await expect(rowB.getByTestId("panel-cell-a")).toContainText(/Last activity(just now|\d+ (seconds?|minutes?) ago)Ines Varga asked for a revision/);

    await page.getByRole("link", { name: "Activity", exact: true }).click();
    await expect(page.getByRole("heading", { level: 1, name: "Activity" })).toBeVisible();
    await expect(page.getByText(/approved a panel \(hash [0-9a-f]{12}…\)/).first()).toBeVisible();
    await expect(page.getByRole("listitem").filter({ hasText: "Ines Varga approved a panel" }).first()).toBeVisible();
    await expect(page.getByText("Ines Varga asked for a revision: “axis title lacks units”")).toBeVisible();
    await expect(page.getByText("npm run audit:verify")).toBeVisible();
    await expect(page.locator("li code").first()).toHaveAttribute("title", /^entry hash [0-9a-f]{64}$/);
    await shoot(page, "activity");

    await page.getByRole("link", { name: "Figure status" }).click();
    const boxA = page.getByTestId(`signoff-box-${a.figureId}`);
    await boxA.getByRole("button", { name: "Sign off this figure" }).click();
    await expect(boxA.getByRole("status")).toContainText("Signed off hash");
    await expect(boxA).toContainText("◆Signed off");
    await expect(boxA.getByRole("list", { name: "Sign-offs" })).toContainText("Mira Halvorsen signed off");
    await expect(boxA).toContainText("on the current version");

    // Someone changes figure B while the PI looks at the figure status: the old hash is refused, then open issues need a reason.
    const boxB = page.getByTestId(`signoff-box-${b.figureId}`);
    await expect(boxB).toContainText("signing off now asks for a reason");
    const changed = { ...SPEC, mark: "circle", title: "Hahn echo, annealed" };
    await api(page).post(`/api/panels/${b.panelId}/revisions`, {
      spec: changed,
      bindings: { echo: { versionId } },
      baseRevisionId: b.revisionId,
      message: "units on the axis",
    });
    await boxB.getByRole("button", { name: "Sign off this figure" }).click();
    await expect(boxB.getByRole("alert")).toContainText("The figure changed since this page loaded");
    await boxB.getByRole("button", { name: "Reload the figure" }).click();
    await expect(boxB.getByRole("button", { name: "Sign off this figure" })).toBeVisible();
    await boxB.getByRole("button", { name: "Sign off this figure" }).click();
    const issues = boxB.getByRole("alert");
    await expect(issues).toContainText("Open issues (panel a is in review)");
    await expect(issues.getByRole("listitem")).toHaveText(["Panel a is in review (not approved)"]);
    await expect(issues.getByRole("link", { name: "Panel a", exact: true })).toHaveAttribute("href", `/panels/${b.panelId}`);
    await expect(boxB.getByRole("button", { name: "Sign off with this reason" })).toBeDisabled();
    await boxB.getByLabel("Reason for signing off with open issues").fill("Units fixed as asked; the reviewer is travelling.");
    await boxB.getByRole("button", { name: "Sign off with this reason" }).click();
    await expect(boxB).toContainText("◆Signed off");
    await expect(boxB).toContainText("Reason: “Units fixed as asked; the reviewer is travelling.”");

    // A change after the sign-off leaves it visible, marked stale.
    await api(page).post(`/api/panels/${a.panelId}/revisions`, {
      spec: changed,
      bindings: { echo: { versionId } },
      baseRevisionId: a.revisionId,
      message: "circles",
    });
    await page.reload();
    await expect(boxA).toContainText("◐In review");
    await expect(boxA).toContainText("Stale — signed off an earlier version of this figure");
    await expect(boxA.getByRole("listitem").first()).toContainText("◇");
    await expect(rowA.getByTestId("panel-cell-a")).toContainText("revision 2");
    await expect(rowA.getByTestId("panel-cell-a").getByTestId("waiting-on")).toContainText("Ines Varga");
    await shoot(page, "figure-status");

    // The figure page renders the same sign-off box.
    const figurePage = await page.goto(`/figures/${b.figureId}`);
    expect(figurePage?.status(), `/figures/${b.figureId}`).toBe(200);
    await expect(page.getByTestId(`signoff-box-${b.figureId}`)).toContainText("Units fixed as asked");

    await page.goto(`/manuscripts/${DEMO_MANUSCRIPT}/activity`);
    await expect(page.getByText(/Mira Halvorsen signed off a figure \(hash [0-9a-f]{12}…\) — reason: “Units fixed/)).toBeVisible();
  });

  test("hostile comment markup stays inert on the review pages; javascript: links are refused", async ({ page }) => {
    const { a } = scene as Required<typeof scene>;
    await signIn(page, "reviewer@partner.example.org");
    const call = api(page);
    const panel = await call.get(`/api/panels/${a.panelId}`);
    const revisionId = panel.currentRevision.id as string;
    const t = await call.post(`/api/panels/${a.panelId}/threads`, { body: doc(HOSTILE), revisionId });
    expect(t.comments[0].html).not.toContain("<img");
    const link = {
      type: "doc",
      content: [{ type: "paragraph", content: [{ type: "text", text: "see", marks: [{ type: "link", attrs: { href: "javascript:window.__xss=1" } }] }] }],
    };
    const refused = await page.request.post(`/api/panels/${a.panelId}/threads`, {
      data: { body: link, revisionId },
      headers: { origin: new URL(page.url()).origin },
    });
    expect(refused.status()).toBe(400);
    // The same markup as a decision note, which the activity log and the figure status print in words
    // ("… asked for a revision: “<note>”"); the panel page shows the comment itself.
    await call.post(`/api/panels/${a.panelId}/approvals`, { revisionId, decision: "needs_revision", note: HOSTILE });
    const asked = `asked for a revision: “${HOSTILE}”`;

    // Each page must answer 200 and show the markup as literal text: then no <img src="x"> exists to
    // fire onerror, and window.__xss was never set. Auto-waiting assertions only — no sleeps.
    const pages = [
      { path: `/manuscripts/${DEMO_MANUSCRIPT}/activity`, payload: () => page.getByText(asked) },
      { path: `/manuscripts/${DEMO_MANUSCRIPT}/status`, payload: () => figureRow(page, a).getByTestId("panel-cell-a").getByText(asked) },
      { path: `/panels/${a.panelId}`, payload: () => page.getByTestId("comment").getByText(HOSTILE, { exact: true }) },
    ];
    for (const { path, payload } of pages) {
      const res = await page.goto(path);
      expect(res?.status(), path).toBe(200);
      await expect(payload(), `${path}: the markup shown as text`).toBeVisible();
      await expect(payload(), path).toContainText(HOSTILE);
      await expect(page.locator('img[src="x"]'), path).toHaveCount(0);
      expect(await page.evaluate(() => (window as unknown as { __xss?: unknown }).__xss), path).toBeUndefined();
    }
    // The former address of the page still leads to it.
    await page.goto(`/manuscripts/${DEMO_MANUSCRIPT}/board`);
    await expect(page).toHaveURL(new RegExp(`/manuscripts/${DEMO_MANUSCRIPT}/status$`));
    await expect(figureRow(page, a).getByTestId("panel-cell-a").getByTestId("open-threads")).toHaveText("1 open thread");
  });

  test("someone with nothing to do sees the empty queue", async ({ page }) => {
    await signIn(page, "viewer@lab.example.org");
    await page.goto("/review");
    await expect(page.getByText("Nothing waits on you.")).toBeVisible();
    await expect(page.getByTestId("waiting-count")).toHaveCount(0);
  });
});
