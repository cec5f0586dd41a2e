// A shift with no network, in Chromium against the production build: sign in online, go offline,
// record a reading and a note, reload while offline (the app and the entries are still there),
// come back online and see the entries reach the server (read through the API by another user
// in a second browser context) with the sync indicator at zero. A second tablet that was offline
// with its own entry converges with the first. Leaves screenshots of the cryostat page with
// unsent entries in both themes.
import type { Page } from "playwright-core";
import { describe, expect, inject, it } from "vitest";
import { screenshot, useTablets, waitPending } from "./support/browser";
import { DEMO_USERS } from "./support/demo-users";

const baseURL = inject("baseURL");
const tablet = useTablets(baseURL);

const indicator = (page: Page) => page.getByTestId("sync-indicator");

async function recordReading(page: Page, value: string): Promise<void> {
  await page.getByRole("tab", { name: "Reading" }).click();
  await page.getByRole("textbox", { name: "Value", exact: true }).fill(value);
  await page.getByRole("button", { name: "Save reading" }).click();
  await page.getByRole("status").filter({ hasText: "Reading saved on this tablet." }).waitFor();
}

async function recordNote(page: Page, text: string): Promise<void> {
  await page.getByRole("tab", { name: "Note" }).click();
  await page.getByRole("textbox", { name: "Note", exact: true }).fill(text);
  await page.getByRole("button", { name: "Save note" }).click();
  await page.getByRole("status").filter({ hasText: "Note saved on this tablet." }).waitFor();
}

const logbook = (page: Page) => page.getByRole("list", { name: "Entries, newest first" });

describe("a shift without network", () => {
  it("keeps entries through an offline reload, sends them when online, and two offline tablets converge", async () => {
    const tag = Date.now().toString(36);
    const noteA = `Bath level steady, transfer line stowed (${tag}-A)`;
    const noteB = `Compressor hum checked (${tag}-B)`;

    const a = await tablet(DEMO_USERS.tomasz.email, { ready: true });
    const b = await tablet(DEMO_USERS.priya.email, { ready: true });

    // Both tablets lose the network.
    await a.context.setOffline(true);
    await b.context.setOffline(true);
    await a.page.waitForFunction(
      () => document.querySelector('[data-testid="sync-indicator"]')?.getAttribute("data-online") === "no",
    );

    // Open a cryostat page never visited online: the service worker serves the page template.
    await a.page.getByRole("link", { name: "Open Wren" }).click();
    await a.page.getByRole("heading", { level: 1, name: "Wren" }).waitFor();
    await recordReading(a.page, "4,21");
    await recordNote(a.page, noteA);
    await waitPending(a.page, 2);
    // Live derived value with no network: a level in % shows its litres (Wren: 0.6 L per %).
    await a.page.getByRole("tab", { name: "Helium level" }).click();
    await a.page.getByRole("textbox", { name: "Level (%)" }).fill("50");
    await a.page
      .locator("#helium-derived")
      .filter({ hasText: /30(\.0+)? L/ })
      .waitFor();
    await a.page.getByRole("tab", { name: "Note" }).click();
    expect(await logbook(a.page).getByText(noteA).isVisible()).toBe(true);
    expect(await logbook(a.page).locator('li[data-sync="pending"]').count()).toBe(2);
    expect(await indicator(a.page).innerText()).toMatch(/Offline · 2 to send/);

    await screenshot(a.page, "offline-cryostat-pending-light");
    await a.page.getByRole("button", { name: "Dim mode" }).click();
    await screenshot(a.page, "offline-cryostat-pending-dim");
    await a.page.getByRole("button", { name: "Light mode" }).click();

    // Reload with no network: the app and both entries are still there.
    await a.page.reload();
    await a.page.getByRole("heading", { level: 1, name: "Wren" }).waitFor();
    await logbook(a.page).getByText(noteA).waitFor();
    await logbook(a.page).getByText("4.21 K").first().waitFor();
    await waitPending(a.page, 2);

    // The second tablet records on its own while offline.
    await b.page.goto("/cryostats/wren").catch(() => undefined);
    await b.page.getByRole("heading", { level: 1, name: "Wren" }).waitFor();
    await recordNote(b.page, noteB);
    await waitPending(b.page, 1);

    // A comes back online: its entries reach the server and the indicator shows nothing pending.
    // API requests go to the network, never answered by the service worker (it serves pages only).
    const api: { path: string; fromWorker: boolean }[] = [];
    a.page.on("response", (r) => {
      const path = new URL(r.url()).pathname;
      if (path.startsWith("/api/")) api.push({ path, fromWorker: r.fromServiceWorker() });
    });
    await a.context.setOffline(false);
    await waitPending(a.page, 0);
    expect(await logbook(a.page).locator('li[data-sync="pending"]').count()).toBe(0);
    expect(api.some((r) => r.path === "/api/sync/push")).toBe(true);
    expect(api.filter((r) => r.fromWorker)).toEqual([]);

    // Checked through the API as another user, in another browser context (B, back online).
    await b.context.setOffline(false);
    const res = await b.page.request.get("/api/cryostats/wren/entries?limit=20");
    expect(res.status()).toBe(200);
    expect(res.headers()["cache-control"]).toBe("no-store");
    const body = (await res.json()) as {
      entries: { kind: string; authorId: string; payload: Record<string, unknown> }[];
    };
    const fromA = body.entries.filter((e) => e.authorId === "u-tomasz");
    expect(fromA.some((e) => e.kind === "note" && e.payload.text === noteA)).toBe(true);
    expect(fromA.some((e) => e.kind === "reading" && e.payload.value === 4.21 && e.payload.unit === "K")).toBe(true);

    // B's own entry goes up too, and each tablet ends with the other's entries.
    await waitPending(b.page, 0);
    await logbook(b.page).getByText(noteA).waitFor({ timeout: 30_000 });
    await a.page.reload(); // page show: A pulls what B sent
    await logbook(a.page).getByText(noteB).waitFor({ timeout: 30_000 });
    await waitPending(a.page, 0);

    // Every entry each tablet holds for Wren is the same set, all synced.
    const idsOf = (page: Page) =>
      page.evaluate(async () => {
        const open = indexedDB.open("rimelog");
        const db: IDBDatabase = await new Promise((resolve, reject) => {
          open.onsuccess = () => resolve(open.result);
          open.onerror = () => reject(open.error);
        });
        const all: { id: string; cryostatId: string; sync: string }[] = await new Promise((resolve, reject) => {
          const r = db.transaction("entries").objectStore("entries").getAll();
          r.onsuccess = () => resolve(r.result);
          r.onerror = () => reject(r.error);
        });
        db.close();
        return all
          .filter((e) => e.cryostatId === "wren")
          .map((e) => `${e.id}:${e.sync}`)
          .sort();
      });
    const [idsA, idsB] = [await idsOf(a.page), await idsOf(b.page)];
    expect(idsA).toEqual(idsB);
    expect(idsA.every((x) => x.endsWith(":synced"))).toBe(true);
    expect(a.errors).toEqual([]);
    expect(b.errors).toEqual([]);
  });

  it("shows an entry the server refused beside it, with the reason, and sends the good one next to it", async () => {
    const tag = Date.now().toString(36);
    const ahead = `Written with the tablet's clock two hours fast (${tag})`;
    const fine = `Written after the clock was set right (${tag})`;
    const a = await tablet(DEMO_USERS.tomasz.email, { ready: true });
    await a.page.getByRole("link", { name: "Open Wren" }).click();
    await a.page.getByRole("heading", { level: 1, name: "Wren" }).waitFor();
    await a.context.setOffline(true);
    // The tablet's clock runs two hours fast (timers keep running): its entry is dated ahead.
    const realNow = Date.now();
    await a.page.clock.setFixedTime(new Date(realNow + 2 * 3_600_000));
    await recordNote(a.page, ahead);
    await a.page.clock.setFixedTime(new Date(realNow + 60_000));
    await recordNote(a.page, fine);
    await waitPending(a.page, 2);
    await a.context.setOffline(false);
    // The good entry is stored; the one dated ahead is refused on its own, and shown with why.
    await waitPending(a.page, 0);
    const refused = logbook(a.page).locator('li[data-sync="rejected"]').filter({ hasText: ahead });
    await refused.waitFor({ timeout: 30_000 });
    expect(await refused.innerText()).toMatch(
      /The server refused this entry: .*ahead of the server's clock.*Set the tablet's date and time/s,
    );
    await logbook(a.page).locator('li[data-sync="synced"]').filter({ hasText: fine }).waitFor({ timeout: 30_000 });
    await screenshot(a.page, "offline-refused-entry");
    expect(a.errors).toEqual([]);
  });

  it("refuses to sign out while entries are unsent, then signs out and clears the tablet", async () => {
    const c = await tablet(DEMO_USERS.mateo.email, { ready: true });
    await c.context.setOffline(true);
    await c.page.goto("/cryostats/heron").catch(() => undefined);
    await c.page.getByRole("heading", { level: 1, name: "Heron" }).waitFor();
    await recordNote(c.page, "Sample mounted, wiring checked");
    await c.page.getByRole("button", { name: "Sign out" }).click();
    await c.page.getByRole("alert").filter({ hasText: "Not signed out: 1 entry" }).waitFor();

    await c.context.setOffline(false);
    await waitPending(c.page, 0);
    await c.page.getByRole("button", { name: "Close" }).click();
    await c.page.getByRole("button", { name: "Sign out" }).click();
    await c.page.waitForURL((url) => url.pathname === "/signin");
    const left = await c.page.evaluate(async () => {
      const open = indexedDB.open("rimelog");
      const db: IDBDatabase = await new Promise((resolve) => (open.onsuccess = () => resolve(open.result)));
      const count = (store: string) =>
        new Promise<number>((resolve) => {
          const r = db.transaction(store).objectStore(store).count();
          r.onsuccess = () => resolve(r.result);
        });
      const out = {
        entries: await count("entries"),
        cryostats: await count("cryostats"),
        outbox: await count("outbox"),
      };
      db.close();
      return out;
    });
    expect(left).toEqual({ entries: 0, cryostats: 0, outbox: 0 });
  });
});
