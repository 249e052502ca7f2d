import { test as base, expect, type BrowserContext, type Page } from "@playwright/test";

/**
 * Every browser test runs with a console guard: any console error or uncaught page error fails the
 * test after it ends, unless the test said beforehand that it provokes it (a refused upload logs the
 * browser's "Failed to load resource … 400", a blocked script logs a CSP violation). Pages of
 * contexts the test opens itself are watched too when opened through `newContext`.
 */
interface ConsoleGuard {
  /** Declares an error this test provokes on purpose; `why` says which step does. */
  allow(pattern: RegExp, why: string): void;
  watch(target: BrowserContext | Page): void;
}

interface Seen {
  where: string;
  text: string;
}

export const test = base.extend<{ consoleGuard: ConsoleGuard; newContext: () => Promise<BrowserContext> }>({
  consoleGuard: [
    async ({ context }, provide) => {
      const allowed: RegExp[] = [];
      const seen: Seen[] = [];
      const watchPage = (page: Page) => {
        page.on("console", (msg) => {
          if (msg.type() === "error") seen.push({ where: page.url(), text: `${msg.text()} ${msg.location().url ?? ""}`.trim() });
        });
        page.on("pageerror", (err) => seen.push({ where: page.url(), text: `page error: ${err.message}` }));
      };
      const guard: ConsoleGuard = {
        allow: (pattern) => allowed.push(pattern),
        watch: (target) => {
          if ("newPage" in target) {
            target.pages().forEach(watchPage);
            target.on("page", watchPage);
          } else watchPage(target);
        },
      };
      guard.watch(context);
      await provide(guard);
      const unexpected = seen.filter((s) => !allowed.some((re) => re.test(s.text)));
      expect(unexpected, "console errors the test did not expect").toEqual([]);
    },
    { auto: true },
  ],
  newContext: async ({ browser, consoleGuard }, provide) => {
    const opened: BrowserContext[] = [];
    await provide(async () => {
      const context = await browser.newContext();
      consoleGuard.watch(context);
      opened.push(context);
      return context;
    });
    await Promise.all(opened.map((c) => c.close()));
  },
});

export { expect };
