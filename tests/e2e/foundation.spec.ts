import { expect, test } from "./fixtures";
import { DEMO_MANUSCRIPT, shoot, signIn, waitForMail } from "./helpers";

const MANUSCRIPT_TITLE = /Coherence and proton NMR of shallow NV centres/;

test("sign-in page", async ({ page }) => {
  await page.goto("/sign-in");
  await expect(page.getByRole("heading", { name: "Sign in to your figures" })).toBeVisible();
  await shoot(page, "sign-in");
});

for (const who of ["pi", "author", "viewer"] as const) {
  test(`${who} signs in and sees exactly the demo manuscript`, async ({ page }) => {
    await signIn(page, `${who}@lab.example.org`);
    const list = page.getByRole("list", { name: "Your manuscripts" });
    await expect(list.getByRole("listitem")).toHaveCount(1);
    await expect(list).toContainText(MANUSCRIPT_TITLE);
    if (who === "pi") await shoot(page, "manuscripts");
  });
}

test("reviewer from a partner institute sees the demo manuscript with their role", async ({ page }) => {
  await signIn(page, "reviewer@partner.example.org");
  await page.getByRole("link", { name: MANUSCRIPT_TITLE }).click();
  await expect(page.getByText("your role")).toBeVisible();
  await expect(page.getByText("Reviewer").first()).toBeVisible();
  await shoot(page, "manuscript");
});

test("the manuscript's API answer reaches the browser gzip-compressed, and as JSON", async ({ page }) => {
  await signIn(page, "author@lab.example.org");
  const answer = await page.evaluate(async (id) => {
    const res = await fetch(`/api/manuscripts/${id}`);
    return { status: res.status, encoding: res.headers.get("content-encoding"), body: await res.json() };
  }, DEMO_MANUSCRIPT);
  expect(answer.status).toBe(200);
  // The server compresses answers of 1 KB or more. Route handlers cannot compress their own: the
  // framework drops their Content-Encoding, so the browser would get gzip bytes it cannot read as JSON.
  expect(answer.encoding).toBe("gzip");
  expect(answer.body.title).toMatch(MANUSCRIPT_TITLE);
  expect(answer.body.role).toBe("author");
  expect(answer.body.figures.length).toBeGreaterThan(0);
});

test("the outsider sees only their own lab's manuscript and gets 404 on the demo one", async ({ page, consoleGuard }) => {
  consoleGuard.allow(/status of 404 .*\/manuscripts\/demo-manuscript$/, "the outsider opens the demo manuscript");
  await signIn(page, "outsider@elsewhere.example.org");
  const list = page.getByRole("list", { name: "Your manuscripts" });
  await expect(list.getByRole("listitem")).toHaveCount(1);
  await expect(list).not.toContainText(MANUSCRIPT_TITLE);
  const res = await page.goto(`/manuscripts/${DEMO_MANUSCRIPT}`);
  expect(res?.status()).toBe(404);
  await expect(page.getByText("Nothing here")).toBeVisible();
  await shoot(page, "not-found");
  const api = await page.request.get(`/api/manuscripts/${DEMO_MANUSCRIPT}`);
  expect(api.status()).toBe(404);
});

test("a wrong password is refused with a clear message", async ({ page }) => {
  await page.goto("/sign-in");
  await page.getByLabel("E-mail", { exact: true }).fill("viewer@lab.example.org");
  await page.getByLabel("Password").fill("not-the-password");
  await page.getByRole("button", { name: "Sign in" }).click();
  await expect(page.getByText("That e-mail and password do not match an account.")).toBeVisible();
});

test("PI invites a reviewer; the mail arrives in the sink and its link creates the account", async ({ page, newContext }) => {
  await signIn(page, "pi@lab.example.org");
  await page.goto(`/manuscripts/${DEMO_MANUSCRIPT}/members`);
  await page.getByLabel("E-mail").fill("new.reviewer@partner.example.org");
  await page.getByLabel("Role", { exact: true }).selectOption("reviewer");
  await page.getByRole("button", { name: "Send invitation" }).click();
  await expect(page.getByRole("status")).toContainText("Invitation sent");
  await shoot(page, "members");

  const mail = await waitForMail("new.reviewer@partner.example.org", /Invitation/);
  const link = /(http\S+\/invite\/\S+)/.exec(mail.text)![1]!;

  await page.goto(`/dev/mail/${mail.id}`);
  await shoot(page, "mail-message");
  await page.goto("/dev/mail");
  await expect(page.getByRole("list", { name: "Received messages" })).toContainText("Invitation");
  await shoot(page, "mail-outbox");

  const guest = await newContext();
  const g = await guest.newPage();
  await g.goto(link);
  await expect(g.getByRole("heading", { name: /Join/ })).toBeVisible();
  await shoot(g, "invitation");
  await g.getByLabel("Your name").fill("Petra Lind");
  await g.getByLabel("Choose a password").fill("reviewer-password-1");
  await g.getByRole("button", { name: "Accept invitation" }).click();
  await expect(g).toHaveURL(new RegExp(`/manuscripts/${DEMO_MANUSCRIPT}`));
  await expect(g.getByRole("heading", { name: MANUSCRIPT_TITLE })).toBeVisible();
  await g.goto(link);
  await expect(g.getByRole("heading", { name: "This invitation cannot be used" })).toBeVisible();
  await guest.close();
});

test("a sign-in link from the sink signs in", async ({ page }) => {
  await page.goto("/sign-in");
  await page.getByLabel("E-mail for the link").fill("author@lab.example.org");
  await page.getByRole("button", { name: "E-mail me a link" }).click();
  await expect(page.getByRole("status")).toContainText("sign-in link is on its way");
  const mail = await waitForMail("author@lab.example.org", /sign-in link/);
  const link = /(http\S+\/sign-in\/link\?token=\S+)/.exec(mail.text)![1]!;
  await page.goto(link);
  await page.getByRole("button", { name: "Continue and sign in" }).click();
  await expect(page).toHaveURL(/\/manuscripts$/);
  await expect(page.getByTestId("signed-in-as")).toContainText("author@lab.example.org");
});

test("a token created on the API-token page works on /api/me", async ({ page, playwright }) => {
  await signIn(page, "viewer@lab.example.org");
  await page.goto("/settings/tokens");
  await page.getByLabel("Name").fill("beamline laptop");
  await page.getByRole("button", { name: "Create token" }).click();
  const token = (await page.getByTestId("new-token").textContent())!.trim();
  await shoot(page, "tokens");
  const api = await playwright.request.newContext();
  const me = await api.get(`${test.info().project.use.baseURL}/api/me`, { headers: { authorization: `Bearer ${token}` } });
  expect(me.status()).toBe(200);
  expect((await me.json()).email).toBe("viewer@lab.example.org");
  await api.dispose();
});

test("signing out ends the session", async ({ page }) => {
  await signIn(page, "viewer@lab.example.org");
  await page.getByRole("button", { name: "Sign out" }).click();
  await expect(page).toHaveURL(/\/sign-in/);
  await page.goto("/manuscripts");
  await expect(page).toHaveURL(/\/sign-in/);
});
