// Sign-in, roles and the admin gate, driven through the production build in Chromium at tablet
// size. Also leaves screenshots of the overview in both themes in screenshots/ for review.
import type { Browser, BrowserContext, Page } from "playwright-core";
import { afterAll, afterEach, beforeAll, beforeEach, describe, expect, inject, it } from "vitest";
import { launchBrowser, newTabletContext, screenshot, signIn, trackPageErrors } from "./support/browser";
import { CRYOSTATS, DEMO_USERS, type DemoUser } from "./support/demo-users";
import { AdminUsersPage, AppHeader, SignInPage } from "./support/pages";

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
  await context?.close();
});

const ROLE_USERS: DemoUser[] = [DEMO_USERS.tomasz, DEMO_USERS.mateo, DEMO_USERS.grace, DEMO_USERS.ines];

describe("signing in", () => {
  it("sends a visitor who is not signed in to the sign-in page", async () => {
    await page.goto("/");
    await page.waitForURL((url) => url.pathname === "/signin");
    await new SignInPage(page).submitButton.waitFor({ state: "visible" });
  });

  it.each(ROLE_USERS.map((user) => [user.role, user] as const))(
    "a %s sees the cryostat room with Heron, Plover and Wren",
    async (_role, user) => {
      const overview = await signIn(page, user.email);
      expect(await overview.heading.isVisible()).toBe(true);
      for (const name of CRYOSTATS) {
        await overview.cryostat(name).waitFor({ state: "visible" });
      }
      expect(await overview.header.root.innerText()).toMatch(user.nameMatch);
      await overview.header.signOutButton.waitFor({ state: "visible" });
      expect(pageErrors).toEqual([]);
    },
  );

  it("refuses a wrong password and says the details did not match", async () => {
    const form = new SignInPage(page);
    await form.goto();
    await form.submit(DEMO_USERS.tomasz.email, "warm-hall-wrong");
    await form.alert.waitFor({ state: "visible" });
    expect(await form.alert.innerText()).toMatch(/did not match/);
    await screenshot(page, "signin-wrong-password");
    expect(new URL(page.url()).pathname).toBe("/signin");
    // Still signed out: the API sees no session.
    const response = await page.request.get("/api/users");
    expect(response.status()).toBe(401);
  });

  it("signs out from the header", async () => {
    const overview = await signIn(page, DEMO_USERS.priya.email);
    await overview.header.signOutButton.click();
    await page.waitForURL((url) => url.pathname === "/signin");
    const response = await page.request.get("/api/users");
    expect(response.status()).toBe(401);
  });
});

describe("people and roles (admin only)", () => {
  it("shows a technician 'Not allowed' on /admin/users", async () => {
    await signIn(page, DEMO_USERS.tomasz.email);
    const admin = new AdminUsersPage(page);
    await admin.goto();
    await admin.notAllowedHeading.waitFor({ state: "visible" });
    expect(await admin.heading.count()).toBe(0);
    await screenshot(page, "admin-not-allowed-technician");
  });

  it("shows the facility admin the people and roles page", async () => {
    await signIn(page, DEMO_USERS.ines.email);
    const admin = new AdminUsersPage(page);
    await admin.goto();
    await admin.heading.waitFor({ state: "visible" });
    expect(await admin.notAllowedHeading.count()).toBe(0);
    await screenshot(page, "admin-people-and-roles");
  });

  it("answers GET /api/users with 401 when nobody is signed in", async () => {
    const response = await fetch(`${baseURL}/api/users`, { redirect: "manual" });
    expect(response.status).toBe(401);
  });

  it("answers GET /api/users with 403 for a technician", async () => {
    await signIn(page, DEMO_USERS.tomasz.email);
    const response = await page.request.get("/api/users", { maxRedirects: 0 });
    expect(response.status()).toBe(403);
  });

  it("answers GET /api/users with the people for the facility admin", async () => {
    await signIn(page, DEMO_USERS.ines.email);
    const response = await page.request.get("/api/users", { maxRedirects: 0 });
    expect(response.status()).toBe(200);
    const body = await response.text();
    for (const user of Object.values(DEMO_USERS)) expect(body).toContain(user.email);
  });
});

describe("themes", () => {
  async function lightThenDim(user: DemoUser, label: string): Promise<void> {
    const overview = await signIn(page, user.email);
    const header = new AppHeader(page);
    // Screenshots are for people to judge the real screen, so wait for the room to be filled in.
    for (const name of CRYOSTATS) await overview.cryostat(name).waitFor({ state: "visible" });
    if ((await header.theme()) === "dim") await header.themeToggle.click();
    await expect.poll(() => header.theme()).not.toBe("dim");
    await screenshot(page, `overview-${label}-light`);

    await header.themeToggle.click();
    await expect.poll(() => header.theme()).toBe("dim");
    expect(await header.storedTheme()).not.toBeNull();
    // The choice survives a reload (it is read back from localStorage).
    await page.reload();
    await overview.heading.waitFor({ state: "visible" });
    await expect.poll(() => header.theme()).toBe("dim");
    for (const name of CRYOSTATS) await overview.cryostat(name).waitFor({ state: "visible" });
    await screenshot(page, `overview-${label}-dim`);

    await header.themeToggle.click();
    await expect.poll(() => header.theme()).not.toBe("dim");
    expect(pageErrors).toEqual([]);
  }

  it("switches a technician's overview between light and dim", async () => {
    await lightThenDim(DEMO_USERS.tomasz, "technician");
  });

  it("switches a safety officer's overview between light and dim", async () => {
    await lightThenDim(DEMO_USERS.grace, "safety-officer");
  });
});
