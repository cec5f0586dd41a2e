// Chromium for the e2e suite: one browser per test file, a fresh tablet-sized context per test,
// sign-in and screenshot helpers. Screenshots go to screenshots/ (gitignored) for people to look at.
import { mkdirSync } from "node:fs";
import { join } from "node:path";
import { fileURLToPath } from "node:url";
import { type Browser, type BrowserContext, chromium, type Page } from "playwright-core";
import { afterAll, beforeAll } from "vitest";
import { assertChromiumInstalled, CHROMIUM_ARGS } from "./chromium";
import { DEMO_PASSWORD } from "./demo-users";
import { OverviewPage, SignInPage } from "./pages";

const ROOT = fileURLToPath(new URL("../../../", import.meta.url));
export const SCREENSHOT_DIR = join(ROOT, "screenshots");

/** A 10-inch tablet in landscape, the device the technicians carry. */
export const TABLET_VIEWPORT = { width: 1024, height: 768 } as const;

export async function launchBrowser(): Promise<Browser> {
  const executablePath = assertChromiumInstalled();
  // `launch` gives every run a fresh temporary profile (user-data dir) of its own.
  return chromium.launch({ executablePath, headless: true, args: CHROMIUM_ARGS });
}

export async function newTabletContext(browser: Browser, baseURL: string): Promise<BrowserContext> {
  const context = await browser.newContext({
    baseURL,
    viewport: TABLET_VIEWPORT,
    hasTouch: true,
    locale: "en-GB",
  });
  context.setDefaultTimeout(15_000);
  context.setDefaultNavigationTimeout(30_000);
  return context;
}

/** Collects uncaught exceptions in the page, so a test can insist there were none. */
export function trackPageErrors(page: Page): string[] {
  const errors: string[] = [];
  page.on("pageerror", (error) => errors.push(`${error.name}: ${error.message}`));
  return errors;
}

/** Signs in through the real form and waits for the overview. */
export async function signIn(page: Page, email: string, password: string = DEMO_PASSWORD): Promise<OverviewPage> {
  const form = new SignInPage(page);
  await form.goto();
  await form.submit(email, password);
  await page.waitForURL((url) => url.pathname === "/");
  const overview = new OverviewPage(page);
  await overview.heading.waitFor({ state: "visible" });
  return overview;
}

export async function screenshot(page: Page, name: string): Promise<string> {
  mkdirSync(SCREENSHOT_DIR, { recursive: true });
  const path = join(SCREENSHOT_DIR, `${name.replace(/[^a-z0-9._-]+/gi, "-")}.png`);
  await page.screenshot({ path, fullPage: true });
  return path;
}

export type Tablet = { context: BrowserContext; page: Page; errors: string[] };

/**
 * One browser for the test file and a tablet (context) per signed-in person, all closed after
 * the file. `ready` also waits until the service worker controls the page (the app shell is
 * precached) and the first sync has filled the tablet store with nothing left to send.
 */
export function useTablets(baseURL: string) {
  let browser: Browser | undefined;
  const contexts: BrowserContext[] = [];
  beforeAll(async () => {
    browser = await launchBrowser();
  });
  afterAll(async () => {
    for (const c of contexts) await c.close().catch(() => undefined);
    await browser?.close();
  });
  return async function tablet(email: string, { ready = false }: { ready?: boolean } = {}): Promise<Tablet> {
    if (!browser) throw new Error("useTablets: the browser is started in beforeAll; ask for a tablet inside a test.");
    const context = await newTabletContext(browser, baseURL);
    contexts.push(context);
    const page = await context.newPage();
    const errors = trackPageErrors(page);
    await signIn(page, email);
    if (ready) {
      await page.evaluate(async () => {
        await navigator.serviceWorker.ready;
      });
      await page.waitForFunction(() => navigator.serviceWorker.controller !== null, undefined, { timeout: 30_000 });
      await page.getByRole("heading", { level: 2, name: "Wren" }).waitFor();
      await waitPending(page, 0);
    }
    return { context, page, errors };
  };
}

/** Waits until the sync indicator shows `n` entries waiting to be sent. */
export async function waitPending(page: Page, n: number, timeout = 30_000): Promise<void> {
  await page.waitForFunction(
    (want) => document.querySelector('[data-testid="sync-indicator"]')?.getAttribute("data-pending") === String(want),
    n,
    { timeout },
  );
}
