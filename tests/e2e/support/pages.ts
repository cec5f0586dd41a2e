// Page objects for the e2e suite. Locators go by role and label, as a screen reader (and a person)
// finds things, so a test breaks when the page stops saying what it does, not when markup moves.
import type { Locator, Page } from "playwright-core";

export class SignInPage {
  readonly email: Locator;
  readonly password: Locator;
  readonly submitButton: Locator;
  readonly alert: Locator;

  constructor(readonly page: Page) {
    this.email = page.getByLabel("Email", { exact: true });
    this.password = page.getByLabel("Password", { exact: true });
    this.submitButton = page.getByRole("button", { name: "Sign in", exact: true });
    this.alert = page.getByRole("alert").filter({ hasText: /\S/ });
  }

  async goto(): Promise<void> {
    await this.page.goto("/signin");
    await this.email.waitFor({ state: "visible" });
  }

  async submit(email: string, password: string): Promise<void> {
    await this.email.fill(email);
    await this.password.fill(password);
    await this.submitButton.click();
  }
}

/** The header every signed-in page carries. */
export class AppHeader {
  readonly root: Locator;
  readonly signOutButton: Locator;
  readonly themeToggle: Locator;

  constructor(readonly page: Page) {
    this.root = page.getByRole("banner");
    this.signOutButton = page.getByRole("button", { name: "Sign out", exact: true });
    this.themeToggle = page.getByRole("button", { name: /^(Dim|Light) mode$/ });
  }

  /** `data-theme` on <html>: "dim" in dim mode, anything else is the light theme. */
  async theme(): Promise<string | null> {
    return this.page.evaluate(() => document.documentElement.getAttribute("data-theme"));
  }

  async storedTheme(): Promise<string | null> {
    return this.page.evaluate(() => window.localStorage.getItem("rimelog-theme"));
  }
}

export class OverviewPage {
  readonly heading: Locator;
  readonly main: Locator;
  readonly header: AppHeader;

  constructor(readonly page: Page) {
    this.heading = page.getByRole("heading", { level: 1, name: "Cryostat room", exact: true });
    this.main = page.getByRole("main");
    this.header = new AppHeader(page);
  }

  cryostat(name: string): Locator {
    return this.main.getByText(new RegExp(`\\b${name}\\b`)).first();
  }
}

export class AdminUsersPage {
  readonly heading: Locator;
  readonly notAllowedHeading: Locator;

  constructor(readonly page: Page) {
    this.heading = page.getByRole("heading", { level: 1, name: "People and roles", exact: true });
    this.notAllowedHeading = page.getByRole("heading", { name: "Not allowed", exact: true });
  }

  async goto(): Promise<void> {
    await this.page.goto("/admin/users");
  }
}
