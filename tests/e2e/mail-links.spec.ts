import fs from "node:fs";
import path from "node:path";
import { type Page } from "@playwright/test";
import { expect, test } from "./fixtures";
import { DEMO_MANUSCRIPT, shoot, signIn, waitForMail } from "./helpers";

// Two notice kinds followed from the mail alone: the mention reaches only the person mentioned, the
// reply only the person who wrote before; each mail's link, opened by its reader, lands on the
// panel with the thread in view.

const SPEC = { $schema: "https://vega.github.io/schema/vega-lite/v6.json", mark: "point", data: { values: [{ x: 1, y: 2 }] } };
const doc = (...content: unknown[]) => ({ type: "doc", content: [{ type: "paragraph", content }] });

/** Every mail in the sink to `to` whose subject matches. */
function mailsTo(to: string, subject: RegExp) {
  const dir = process.env.MAIL_SINK_DIR!;
  return fs
    .readdirSync(dir)
    .filter((f) => f.endsWith(".json"))
    .map((f) => JSON.parse(fs.readFileSync(path.join(dir, f), "utf8")) as { envelope: { to: string[] }; subject: string; text: string })
    .filter((m) => m.envelope.to.includes(to) && subject.test(m.subject));
}
const linkIn = (text: string) => /^Open: (\S+)$/m.exec(text)![1]!;

async function post(page: Page, url: string, data: unknown) {
  const res = await page.request.post(url, { data, headers: { origin: new URL(page.url()).origin } });
  expect(res.status(), await res.text()).toBe(201);
  return res.json();
}

test("a mention and a reply: one mail each, to the right person, whose link opens the thread", async ({ page, newContext }) => {
  await signIn(page, "author@lab.example.org");
  const figure = await post(page, "/api/figures", { manuscriptId: DEMO_MANUSCRIPT, title: "Mail link check" });
  const panel = await post(page, `/api/figures/${figure.id}/panels`, { title: "Linked" });
  const revision = await post(page, `/api/panels/${panel.id}/revisions`, { spec: SPEC, bindings: {}, baseRevisionId: null, message: "first" });

  // The reviewer starts a thread mentioning the PI.
  const reviewer = await (await newContext()).newPage();
  await signIn(reviewer, "reviewer@partner.example.org");
  const mention = { type: "mention", attrs: { id: "demo-pi", label: "Mira Halvorsen" } };
  const thread = await post(reviewer, `/api/panels/${panel.id}/threads`, {
    revisionId: revision.id,
    body: doc(mention, { type: "text", text: " is the field calibrated?" }),
  });
  const subject = new RegExp(`^Ines Varga mentioned you on Figure ${figure.number}a — `);
  const mentionMail = await waitForMail("pi@lab.example.org", subject);
  expect(mailsTo("pi@lab.example.org", subject)).toHaveLength(1);
  expect(mailsTo("author@lab.example.org", subject)).toHaveLength(0);
  const mentionLink = linkIn(mentionMail.text);
  expect(new URL(mentionLink).pathname + new URL(mentionLink).hash).toBe(`/panels/${panel.id}#thread-${thread.id}`);

  // The PI follows the link and replies in the thread through the page.
  const pi = await (await newContext()).newPage();
  await signIn(pi, "pi@lab.example.org");
  await pi.goto(mentionLink);
  const shown = pi.locator(`#thread-${thread.id}`);
  await expect(shown).toBeInViewport();
  await expect(shown).toContainText("is the field calibrated?");
  await shoot(pi, "mail-link-mention");
  await shown.getByRole("button", { name: "Reply", exact: true }).click();
  await pi.getByRole("textbox", { name: "Reply in thread 1", exact: true }).fill("Yes, against the proton line.");
  await pi.getByRole("button", { name: "Send reply", exact: true }).click();
  await expect(shown).toContainText("Yes, against the proton line.");

  // The reviewer, who wrote first, hears of the reply once; the author, who never wrote, does not.
  const replySubject = new RegExp(`^Mira Halvorsen replied on Figure ${figure.number}a — `);
  const replyMail = await waitForMail("reviewer@partner.example.org", replySubject);
  expect(mailsTo("reviewer@partner.example.org", replySubject)).toHaveLength(1);
  expect(mailsTo("author@lab.example.org", replySubject)).toHaveLength(0);
  await reviewer.goto(linkIn(replyMail.text));
  const theirs = reviewer.locator(`#thread-${thread.id}`);
  await expect(theirs).toBeInViewport();
  await expect(theirs).toContainText("Yes, against the proton line.");
  await expect(theirs.getByRole("button", { name: "Mail me replies", exact: true })).toHaveAttribute("aria-pressed", "true");
  await shoot(reviewer, "mail-link-reply");

  // The reviewer stops this thread's replies, then unfollows the figure on the mail settings page.
  await theirs.getByRole("button", { name: "Mail me replies", exact: true }).click();
  await expect(theirs.getByRole("button", { name: "Mail me replies", exact: true })).toHaveAttribute("aria-pressed", "false");
  await reviewer.reload();
  await expect(reviewer.locator(`#thread-${thread.id}`).getByRole("button", { name: "Mail me replies", exact: true })).toHaveAttribute("aria-pressed", "false");
  await reviewer.getByRole("link", { name: "Mail settings", exact: true }).click();
  const box = reviewer.getByRole("checkbox", { name: `Figure ${figure.number} — Mail link check`, exact: true });
  await expect(box).toBeChecked();
  await box.uncheck();
  await reviewer.getByRole("button", { name: "Save mail settings", exact: true }).click();
  await expect(reviewer.getByText("Saved: your mail follows these choices from now on.")).toBeVisible();
  await reviewer.reload();
  await expect(reviewer.getByRole("checkbox", { name: `Figure ${figure.number} — Mail link check`, exact: true })).not.toBeChecked();
  await shoot(reviewer, "mail-settings-figures");
});
