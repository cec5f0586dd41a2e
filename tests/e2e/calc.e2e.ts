// Calculators offline and the cryostat charts, in Chromium at tablet size against the production
// build. Leaves screenshots of the calculators and the charts in both themes in screenshots/.
import type { Browser, BrowserContext, Page } from "playwright-core";
import { afterAll, afterEach, beforeAll, beforeEach, describe, expect, inject, it } from "vitest";
import { launchBrowser, newTabletContext, screenshot, signIn, trackPageErrors } from "./support/browser";
import { DEMO_USERS } from "./support/demo-users";
import { AppHeader } from "./support/pages";

const baseURL = inject("baseURL");

let browser: Browser;
let context: BrowserContext;
let page: Page;
let pageErrors: string[];

beforeAll(async () => {
  browser = await launchBrowser();
});

afterAll(async () => {
  await browser?.close();
});

beforeEach(async () => {
  context = await newTabletContext(browser, baseURL);
  page = await context.newPage();
  pageErrors = trackPageErrors(page);
});

afterEach(async () => {
  // After an offline spell with a service worker, closing a context has hung here; the browser
  // closes in afterAll in any case, so wait a bounded time only.
  await Promise.race([context?.close().catch(() => undefined), new Promise((r) => setTimeout(r, 10_000))]);
});

/** Wait until the service worker is active and controls this page (reloading once if needed). */
async function waitForServiceWorkerControl(p: Page): Promise<void> {
  await p.evaluate(async () => {
    await navigator.serviceWorker.ready;
  });
  for (let i = 0; i < 3; i++) {
    if (await p.evaluate(() => Boolean(navigator.serviceWorker.controller))) return;
    await p.reload();
    await p.evaluate(async () => {
      await navigator.serviceWorker.ready;
    });
  }
  expect(await p.evaluate(() => Boolean(navigator.serviceWorker.controller))).toBe(true);
}

async function setTheme(p: Page, theme: "light" | "dim"): Promise<void> {
  const header = new AppHeader(p);
  const now = (await header.theme()) === "dim" ? "dim" : "light";
  if (now !== theme) await header.themeToggle.click();
  expect((await header.theme()) === "dim" ? "dim" : "light").toBe(theme);
}

describe("calculators", () => {
  it("work offline after one visit: ITS-90 100 mbar of 4He is 2.48856 K; out of range is a message", async () => {
    await signIn(page, DEMO_USERS.tomasz.email);
    await page.goto("/calc#its90");
    await page.getByRole("heading", { level: 1, name: "Calculators" }).waitFor();
    await waitForServiceWorkerControl(page);

    await context.setOffline(true);
    await page.reload();
    await page.getByRole("heading", { level: 2, name: "Helium vapour-pressure thermometry", exact: true }).waitFor();
    expect(await page.evaluate(() => navigator.onLine)).toBe(false);

    const pressure = page.getByLabel("Pressure", { exact: true });
    await pressure.fill("100");
    const results = page.locator('dl[aria-label="Vapour pressure → temperature: results"]');
    // ITS-90 eq. (3) with the Table 3 4He coefficients: 10 000 Pa → 2.488559 K (lib/cryo/README.md [calc]).
    await expect.poll(() => results.innerText()).toContain("2.48856 K");

    await pressure.fill("0.01");
    const alert = page.getByRole("alert").filter({ hasText: "below the ITS-90 range" });
    await alert.waitFor();
    expect(await page.locator("text=NaN").count()).toBe(0);

    // Another section of the same cached page, still offline.
    await page.getByRole("link", { name: "Oxygen", exact: true }).click();
    await page.getByRole("heading", { level: 2, name: "Oxygen deficiency", exact: true }).waitFor();
    // 30 m³ into the 220 m³ room (hand arithmetic, lib/cryo/README.md forms): displacement
    // 20.9 %·190/220 = 18.05 % O2, the conservative figure; mixed with outflow 20.9 %·e^(−30/220) = 18.24 %.
    await page.getByLabel("Gas released").fill("30");
    const sudden = page.locator('dl[aria-label="Sudden release: results"]');
    await expect.poll(() => sudden.innerText()).toContain("18.05 % O₂");
    expect(await sudden.innerText()).toContain("18.24 % O₂");
    expect(await sudden.innerText()).toContain("conservative figure");

    for (const [section, theme] of [
      ["its90", "light"],
      ["its90", "dim"],
      ["magnet", "light"],
      ["magnet", "dim"],
      ["oxygen", "dim"],
      ["transport", "light"],
    ] as const) {
      await page.goto(`/calc#${section}`);
      await page.getByRole("navigation", { name: "Calculator sections" }).waitFor();
      await setTheme(page, theme);
      await page.waitForTimeout(300);
      await screenshot(page, `calc-${section}-${theme}`);
    }
    await context.setOffline(false);
    expect(pageErrors).toEqual([]);
  });
});

describe("cryostat charts", () => {
  it.each(["heron", "plover"])("render for %s from the demo log, in both themes", async (id) => {
    await signIn(page, DEMO_USERS.tomasz.email);
    await page.goto(`/cryostats/${id}`);
    const charts = page.getByTestId("cryostat-charts");
    await charts.locator("canvas").first().waitFor({ state: "attached" });
    await charts.scrollIntoViewIfNeeded();
    if (id === "heron") {
      await charts
        .getByRole("figure", { name: /Stage temperatures/ })
        .locator("canvas")
        .waitFor({ state: "attached" });
      await charts
        .getByRole("figure", { name: /Magnet field/ })
        .locator("canvas")
        .waitFor({ state: "attached" });
    } else {
      await charts
        .getByRole("figure", { name: /Helium level/ })
        .locator("canvas")
        .waitFor({ state: "attached" });
      expect(await charts.getByTestId("helium-forecast").innerText()).toMatch(
        /Boil-off since the last fill: [\d.]+ ± [\d.]+ L\/day/,
      );
    }
    for (const theme of ["light", "dim"] as const) {
      await setTheme(page, theme);
      await page.waitForTimeout(400);
      await charts.scrollIntoViewIfNeeded();
      const path = await screenshot(page, `charts-${id}-page-${theme}`);
      await charts.screenshot({ path: path.replace("-page-", "-") });
    }
    expect(pageErrors).toEqual([]);
  });
});
