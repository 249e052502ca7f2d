import { expect, test } from "./fixtures";
import { api, DEMO_MANUSCRIPT, shoot, signIn, waitForMail } from "./helpers";

const SPEC = {
  $schema: "https://vega.github.io/schema/vega-lite/v6.json",
  data: { name: "echo" },
  mark: "point",
  encoding: { x: { field: "tau", type: "quantitative" }, y: { field: "signal", type: "quantitative" } },
};
const doc = (text: string) => ({ type: "doc", content: [{ type: "paragraph", content: [{ type: "text", text }] }] });
const QUESTION = "Is the echo baseline flat beyond 2 ms?";
const WITHDRAWN = "The time axis must start at zero.";

const scene: { figureId?: string; number?: number; panelId?: string; revisionId?: string; threadId?: string } = {};

test.describe.serial("review at the edges: drafts, open issues at sign-off, withdrawal, archive", () => {
  test("a new panel is a draft until its author sends it to review; then the reviewer is asked", async ({ page }) => {
    await signIn(page, "author@lab.example.org");
    const call = api(page);
    const { items } = (await call.get(`/api/manuscripts/${DEMO_MANUSCRIPT}/datasets`)) as {
      items: Array<{ kind: string; tags: Record<string, string>; latestVersion: { id: string } | null }>;
    };
    const echo = items.find((d) => d.kind === "hahn_echo" && !d.tags.derivedFrom && d.latestVersion)!;
    const figure = await call.post("/api/figures", { manuscriptId: DEMO_MANUSCRIPT, title: "Edges of review" });
    const panel = await call.post(`/api/figures/${figure.id}/panels`, { title: "Echo, draft first" });
    const revision = await call.post(`/api/panels/${panel.id}/revisions`, {
      spec: SPEC,
      bindings: { echo: { versionId: echo.latestVersion!.id } },
      baseRevisionId: null,
      message: "first cut",
    });
    Object.assign(scene, { figureId: figure.id, number: figure.number, panelId: panel.id, revisionId: revision.id });

    await page.goto(`/panels/${panel.id}`);
    const draft = page.getByRole("region", { name: "Draft", exact: true });
    await expect(draft).toContainText("Draft — reviewers are not asked yet");
    await expect(draft).toContainText("approvals and requests for a revision wait until it is in review");
    await shoot(page, "panel-draft");
    await page.getByRole("button", { name: "Send to review", exact: true }).click();
    await expect(page.getByText("Sent to review: the reviewers are asked.")).toBeVisible();
    await expect(draft).toHaveCount(0);
    await waitForMail("reviewer@partner.example.org", new RegExp(`^Review requested: Figure ${figure.number}a — `));
  });

  test("signing off with an open thread lists it, with a link to the thread, and asks for a reason", async ({ page, consoleGuard }) => {
    consoleGuard.allow(/status of 400 .*\/api\/figures\/[\w-]+\/signoff$/, "an open thread asks for a reason first");
    await signIn(page, "reviewer@partner.example.org");
    const call = api(page);
    const thread = await call.post(`/api/panels/${scene.panelId}/threads`, { body: doc(QUESTION), revisionId: scene.revisionId });
    scene.threadId = thread.id;
    await call.post(`/api/panels/${scene.panelId}/approvals`, { revisionId: scene.revisionId, decision: "approved" });
    await page.context().clearCookies();

    await signIn(page, "pi@lab.example.org");
    await page.goto(`/figures/${scene.figureId}`);
    const box = page.getByTestId(`signoff-box-${scene.figureId}`);
    await box.getByRole("button", { name: "Sign off this figure", exact: true }).click();
    const issues = box.getByRole("list", { name: "Open issues" });
    await expect(issues).toContainText("Panel a is approved");
    const link = issues.getByRole("link", { name: `“${QUESTION}”`, exact: true });
    await expect(link).toHaveAttribute("href", `/panels/${scene.panelId}#thread-${scene.threadId}`);
    await shoot(page, "signoff-open-issues");
    await box.getByLabel("Reason for signing off with open issues", { exact: true }).fill("The baseline question is answered in the caption.");
    await box.getByRole("button", { name: "Sign off with this reason", exact: true }).click();
    await expect(box).toContainText("◆Signed off");
  });

  test("the PI withdraws the sign-off with a reason; it stays on record as withdrawn", async ({ page }) => {
    await signIn(page, "pi@lab.example.org");
    await page.goto(`/figures/${scene.figureId}`);
    const box = page.getByTestId(`signoff-box-${scene.figureId}`);
    await box.getByRole("button", { name: "Withdraw sign-off", exact: true }).click();
    const form = box.getByRole("form", { name: "Withdraw sign-off" });
    await form.getByLabel("Reason for withdrawing", { exact: true }).fill(WITHDRAWN);
    await form.getByRole("button", { name: "Withdraw with this reason", exact: true }).click();
    await expect(box.getByRole("list", { name: "Sign-offs" })).toContainText(`Sign-off withdrawn by Mira Halvorsen — ${WITHDRAWN}`);
    await expect(box).toContainText("✓Approved");
    await expect(box.getByRole("button", { name: "Sign off this figure", exact: true })).toBeVisible();
    await shoot(page, "signoff-withdrawn");
    await page.goto(`/manuscripts/${DEMO_MANUSCRIPT}/activity`);
    await expect(page.getByText(`withdrew a sign-off`).first()).toBeVisible();
  });

  test("archiving a figure takes it out of the list; Show archived finds it; its page shows the banner and restores it", async ({ page }) => {
    await signIn(page, "author@lab.example.org");
    await page.goto(`/manuscripts/${DEMO_MANUSCRIPT}`);
    const figures = page.getByRole("list", { name: "Figures" });
    const item = figures
      .getByRole("listitem")
      .filter({ hasText: `Figure ${scene.number}` })
      .filter({ hasText: "Edges of review" });
    await item.getByRole("button", { name: "Archive", exact: true }).click();
    await expect(item).toHaveCount(0);
    await page.getByLabel("Show archived", { exact: true }).check();
    await expect(item).toBeVisible();
    await expect(item.getByRole("button", { name: "Restore", exact: true })).toBeVisible();
    await shoot(page, "figures-archived");

    await page.goto(`/figures/${scene.figureId}`);
    const banner = page.getByRole("status", { name: "Archived" });
    await expect(banner).toContainText("still opens it");
    await banner.getByRole("button", { name: "Restore", exact: true }).click();
    await expect(banner).toHaveCount(0);
    await page.goto(`/manuscripts/${DEMO_MANUSCRIPT}`);
    await expect(item).toBeVisible();
  });
});
