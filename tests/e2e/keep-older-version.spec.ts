import { expect, test } from "./fixtures";
import { DEMO_MANUSCRIPT, api, shoot, signIn } from "./helpers";

const SPEC = {
  $schema: "https://vega.github.io/schema/vega-lite/v6.json",
  data: { name: "spectrum" },
  mark: "line",
  encoding: {
    x: { field: "wavelength", type: "quantitative", title: "wavelength (nm)" },
    y: { field: "counts", type: "quantitative", title: "PL (counts/s)" },
  },
};
const csv = (offset: number) =>
  `wavelength (nm),counts (counts/s)\n${Array.from({ length: 20 }, (_, i) => `${600 + 5 * i},${1000 + offset + 40 * Math.sin(i)}`).join("\n")}\n`;

test("the author keeps an older data version on purpose from the print check, with a reason, and the review stands", async ({ page }) => {
  await signIn(page, "author@lab.example.org");
  const call = api(page);
  const upload = async (extra: Record<string, string> = {}, offset = 0) => {
    const res = await page.request.post(`/api/manuscripts/${DEMO_MANUSCRIPT}/datasets`, {
      headers: { origin: new URL(page.url()).origin },
      multipart: { file: { name: "pl-spectrum-k21.csv", mimeType: "text/csv", buffer: Buffer.from(csv(offset)) }, ...extra },
    });
    expect(res.status()).toBe(201);
    return (await res.json()) as { id: string; datasetId: string; number: number };
  };
  const first = await upload();
  const figure = await call.post("/api/figures", { manuscriptId: DEMO_MANUSCRIPT, title: "Raw PL spectrum" });
  const panel = await call.post(`/api/figures/${figure.id}/panels`, { title: "Spectrum" });
  const revision = await call.post(`/api/panels/${panel.id}/revisions`, {
    spec: SPEC,
    bindings: { spectrum: { versionId: first.id } },
    baseRevisionId: null,
    message: "first cut",
  });
  // A dark-subtracted version 2 arrives; the panel stays on version 1.
  expect((await upload({ datasetId: first.datasetId }, -200)).number).toBe(2);

  await page.goto(`/figures/${figure.id}`);
  const check = page.getByTestId(`print-check-${figure.id}`);
  await expect(check).toContainText("is bound to “pl-spectrum-k21.csv” version 1, but version 2 is the latest");
  await check.getByRole("button", { name: "Keep version 1 of “pl-spectrum-k21.csv” in panel a on purpose…" }).click();
  await check.getByRole("button", { name: "Keep it" }).click();
  await expect(check.getByRole("alert")).toContainText("Say why this version is kept");
  await check.getByLabel("Why keep version 1 of “pl-spectrum-k21.csv” in panel a?").fill("version 2 is dark-subtracted and hides the NV⁰ line");
  await check.getByRole("button", { name: "Keep it" }).click();
  await expect(check.getByRole("status")).toContainText("Kept: revision 2 of panel a records why; its content is unchanged, so reviews stand.");
  await expect(check.getByRole("listitem").filter({ hasText: "Every panel bound to its dataset's latest version" })).toContainText(
    "1 older one kept on purpose",
  );
  await shoot(page, "figure-print-check-kept");

  // The new revision carries the reason, and the content hash is the first revision's.
  const current = (await call.get(`/api/panels/${panel.id}`)).currentRevision as { number: number; message: string; contentHash: string };
  expect(current).toMatchObject({
    number: 2,
    message: "keep version 1: version 2 is dark-subtracted and hides the NV⁰ line",
    contentHash: revision.contentHash,
  });
});
