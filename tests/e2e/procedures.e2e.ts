// A cooldown run with no network, in Chromium against the production build: the technician sets a
// signing PIN online, goes offline, runs the dry-fridge cooldown from start to finish (ticks,
// readings on the keypad with one out of range and commented, a photo, hold points signed with a
// drawn signature and the PIN), reloads mid-run while offline and carries on, completes with a
// signature, then goes online. The run, its photo and its signatures reach the server, and the
// safety officer opens the run record with the signature manifestation. Leaves screenshots of the
// run screen at 1024×768 and 768×1024 in both themes.
import type { Page } from "playwright-core";
import { describe, expect, inject, it } from "vitest";
import { screenshot, useTablets, waitPending as waitPendingFor } from "./support/browser";
import { DEMO_PASSWORD, DEMO_USERS } from "./support/demo-users";

const baseURL = inject("baseURL");
const tablet = useTablets(baseURL);

const PIN = "482916";
// A 2×2 PNG, as a camera would hand over a JPEG: the bytes matter only for the upload's type check.
const PHOTO = Buffer.from(
  "iVBORw0KGgoAAAANSUhEUgAAAAIAAAACCAIAAAD91JpzAAAAFklEQVR4nGP8z8DAwMDAxMDAwMDAAAANHQEDasKb6QAAAABJRU5ErkJggg==",
  "base64",
);
const waitPending = (page: Page, n: number, timeout = 60_000) => waitPendingFor(page, n, timeout);

const step = (page: Page, id: string) => page.locator(`[data-step="${id}"]`);

const mark = (what: string) => console.log(`[procedures e2e] ${new Date().toISOString().slice(11, 19)} ${what}`);

async function next(page: Page) {
  await page.getByRole("button", { name: "Next step →" }).click();
}

async function tick(page: Page, id: string) {
  await step(page, id).getByRole("button", { name: "✓ Done" }).click();
  await page.locator(`[data-step="${id}"][data-status="done"]`).waitFor();
  await next(page);
}

async function acknowledge(page: Page, id: string) {
  await step(page, id).getByRole("button", { name: "I have read this caution" }).click();
  await page.locator(`[data-step="${id}"][data-status="done"]`).waitFor();
  await next(page);
}

async function reading(page: Page, id: string, value: string, { keypad = false } = {}) {
  const s = step(page, id);
  if (keypad) {
    for (const k of value)
      await s
        .getByRole("group", { name: /Keypad/ })
        .getByRole("button", { name: k === "." ? "Decimal point" : k, exact: true })
        .click();
  } else {
    await s.getByLabel(/^Value in/).fill(value);
  }
  await s.getByRole("status").filter({ hasText: "Within range." }).waitFor();
  await s.getByRole("button", { name: "Record reading" }).click();
  await page.locator(`[data-step="${id}"][data-status="done"]`).waitFor();
  await next(page);
}

/** Draws a stroke on the pad like a stylus would, then confirms with the PIN. */
async function signWithPin(page: Page, buttonName: string, signLabel: string) {
  await page.getByRole("button", { name: buttonName }).click();
  const dialog = page.getByRole("dialog");
  const pad = dialog.getByRole("img", { name: "Signature pad" });
  const box = (await pad.boundingBox())!;
  await page.mouse.move(box.x + 30, box.y + 120);
  await page.mouse.down();
  for (let i = 1; i <= 20; i++)
    await page.mouse.move(box.x + 30 + i * 14, box.y + 120 - 40 * Math.sin(i / 3), { steps: 2 });
  await page.mouse.up();
  await dialog.getByLabel("Signing PIN").fill(PIN);
  await dialog.getByRole("button", { name: signLabel }).click();
  await dialog.waitFor({ state: "detached", timeout: 30_000 });
}

async function shots(page: Page, name: string) {
  // Full-page shots with a sticky header come out clean only from the top of the page.
  await page.evaluate(() => window.scrollTo(0, 0));
  for (const [w, h] of [
    [1024, 768],
    [768, 1024],
  ] as const) {
    await page.setViewportSize({ width: w, height: h });
    await screenshot(page, `${name}-${w}x${h}-light`);
    await page.getByRole("button", { name: "Dim mode" }).click();
    await screenshot(page, `${name}-${w}x${h}-dim`);
    await page.getByRole("button", { name: "Light mode" }).click();
  }
  await page.setViewportSize({ width: 1024, height: 768 });
}

describe("procedures on a tablet with no network", () => {
  it("runs a cooldown offline end to end, syncs it, and the safety officer sees the signed record", async () => {
    const t = await tablet(DEMO_USERS.tomasz.email, { ready: true });
    const { page } = t;

    // Online once: set the signing PIN (needs the password again).
    await page.getByRole("link", { name: "Procedures" }).click();
    await page.getByRole("heading", { level: 1, name: "Procedures" }).waitFor();
    await page.getByRole("button", { name: "Set PIN" }).click();
    await page.getByLabel("Your password").fill(DEMO_PASSWORD);
    await page.getByLabel("New PIN (6–12 digits)").fill(PIN);
    await page.getByLabel("PIN again").fill(PIN);
    await page.getByRole("button", { name: "Save PIN" }).click();
    await page.getByRole("status").filter({ hasText: "Signing PIN set on this tablet." }).waitFor();

    // No network from here to the end of the run.
    await t.context.setOffline(true);
    await page.getByRole("button", { name: "Start Cooldown — dry dilution refrigerator on Heron" }).click();
    // One more tap confirms: a mis-tap starts nothing.
    await page
      .getByRole("dialog", { name: /Start Cooldown — dry dilution refrigerator\?/ })
      .getByRole("button", { name: "Yes, start" })
      .click();
    // Offline, Chromium reports the service worker's answer to a navigation as "aborted": wait for the page instead.
    await page
      .getByRole("heading", { level: 1, name: /Cooldown — dry dilution refrigerator — Heron/ })
      .waitFor({ timeout: 30_000 });
    const runId = new URL(page.url()).searchParams.get("id")!;
    expect(runId).toMatch(/^[0-9a-f-]{36}$/);

    mark("run opened offline");
    await acknowledge(page, "caution-pressure");
    await tick(page, "probe-closed");
    await reading(page, "ovc-pressure", "0.00005");
    await tick(page, "leak-check");

    // Out of range: flagged at once, the step's own advice shown, and a comment is required.
    const tank = step(page, "tank-before");
    for (const k of "640")
      await tank
        .getByRole("group", { name: /Keypad/ })
        .getByRole("button", { name: k, exact: true })
        .click();
    await tank.getByRole("status").filter({ hasText: "Out of range: below 700 – 900 mbar." }).waitFor();
    await tank.getByText("Do not condense.").waitFor();
    expect(await tank.getByRole("button", { name: "Record flagged reading" }).isDisabled()).toBe(true);
    await tank
      .getByLabel(/^Comment/)
      .fill("Tank low after the last warmup: facility admin told, mixture topped up from the reserve.");
    await shots(page, "run-reading-out-of-range");
    await tank.getByRole("button", { name: "Record flagged reading" }).click();
    await page.locator('[data-step="tank-before"][data-status="flagged"]').waitFor();
    await next(page);

    await tick(page, "cold-trap");
    await tick(page, "compressor");
    await reading(page, "precool-pt1", "45", { keypad: true });
    await reading(page, "precool-pt2", "3.4", { keypad: true });

    mark("first readings done");
    // Hold point: the steps after it wait until it is signed.
    await page.locator('[data-step="hold-precool"][data-status="todo"]').waitFor();
    await signWithPin(page, "✍ Sign hold point", "Sign: Verified");
    await page.locator('[data-step="hold-precool"][data-status="done"]').waitFor();
    await step(page, "hold-precool").locator("[data-signature]").getByText("Verified — Tomasz Okafor").waitFor();

    mark("first hold signed");
    // Reload in the middle of the run with no network: the run is still there, at the next step.
    await page.reload();
    await page.getByRole("heading", { level: 1, name: /Cooldown — dry dilution refrigerator — Heron/ }).waitFor();
    await step(page, "caution-condense").waitFor();
    expect(await page.getByRole("progressbar", { name: "Run progress" }).getAttribute("aria-valuenow")).toBe("53");

    await acknowledge(page, "caution-condense");
    await reading(page, "condense-pressure", "1.8");
    await reading(page, "tank-after", "20");
    await tick(page, "circulation");
    await reading(page, "still-pressure", "0.05");
    await reading(page, "flow", "450");
    await reading(page, "mxc-base", "11", { keypad: true });

    mark("after reload, readings done");
    // A photo from the camera, kept on the tablet until the sync uploads it.
    await step(page, "panel-photo")
      .getByLabel("Take a photo")
      .setInputFiles({ name: "gas-panel.png", mimeType: "image/png", buffer: PHOTO });
    await page.locator('[data-step="panel-photo"][data-status="done"]').waitFor();
    await step(page, "panel-photo").getByRole("img", { name: "Photo for this step" }).waitFor();
    await next(page);

    await signWithPin(page, "✍ Sign hold point", "Sign: Verified");
    await page.locator('[data-step="hold-base"][data-status="done"]').waitFor();
    await next(page);
    await step(page, "remarks").getByLabel("Note").fill("Base reached in 58 h; still heater at the usual power.");
    await step(page, "remarks").getByRole("button", { name: "Save note" }).click();
    await page.locator('[data-step="remarks"][data-status="done"]').waitFor();
    await shots(page, "run-step");

    await page.getByRole("tab", { name: "All steps" }).click();
    await page.evaluate(() => window.scrollTo(0, 0));
    await screenshot(page, "run-list-1024x768-light");
    await page.getByRole("tab", { name: "One step" }).click();

    expect(await page.getByRole("progressbar", { name: "Run progress" }).getAttribute("aria-valuenow")).toBe("100");
    await signWithPin(page, "✍ Complete and sign", "Sign: Performed");
    await page.getByText("Completed", { exact: true }).first().waitFor();
    // Everything is still only on this tablet.
    expect(Number(await page.getByTestId("sync-indicator").getAttribute("data-pending"))).toBeGreaterThan(20);

    mark("completed offline");
    // Back online: the photo and every entry reach the server.
    await t.context.setOffline(false);
    await waitPending(page, 0, 90_000);
    const res = await page.request.get(`/api/runs?id=${runId}`);
    expect(res.status()).toBe(200);
    const record = (await res.json()) as {
      run: { status: string; templateId: string };
      template: { version: number };
      entries: { kind: string; payload: Record<string, unknown> }[];
    };
    expect(record.run.status).toBe("completed");
    expect(record.template.version).toBe(1);
    const sigs = record.entries.filter((e) => e.kind === "signature");
    expect(sigs.map((s) => s.payload.meaning).sort()).toEqual(["performed", "verified", "verified"]);
    expect(
      sigs.every(
        (s) => s.payload.confirmedBy === "pin" && String(s.payload.image).startsWith("data:image/png;base64,"),
      ),
    ).toBe(true);
    const flagged = record.entries.find((e) => e.kind === "run.step" && e.payload.stepId === "tank-before");
    expect(flagged?.payload).toMatchObject({ value: 640, outOfRange: true });
    const photo = record.entries.find((e) => e.kind === "run.step" && e.payload.kind === "photo");
    const file = await page.request.get(`/api/attachments/${String(photo?.payload.attachmentId)}`);
    expect(file.status()).toBe(200);
    expect(
      Buffer.from(await file.body())
        .subarray(0, 8)
        .equals(PHOTO.subarray(0, 8)),
    ).toBe(true);

    mark("synced to the server");
    // The safety officer, on her own tablet, opens the run record with the manifestations.
    const g = await tablet(DEMO_USERS.grace.email, { ready: true });
    await g.page.goto(`/runs?id=${runId}&view=record`);
    const rec = g.page.getByRole("article", { name: "Run record" });
    await rec.waitFor({ timeout: 60_000 });
    await rec
      .locator('[data-record-step="hold-precool"] [data-signature]')
      .getByText("Verified — Tomasz Okafor")
      .waitFor();
    const manifest = await rec.locator("[data-signature]").allInnerTexts();
    expect(manifest.length).toBe(3);
    for (const m of manifest) {
      expect(m).toMatch(/Tomasz Okafor/);
      expect(m).toMatch(/Technician/);
      expect(m).toMatch(/\d{2} \w{3} \d{4}, \d{2}:\d{2}/);
      expect(m).toMatch(/identity confirmed with PIN/);
    }
    expect(manifest.some((m) => /Performed/.test(m))).toBe(true);
    await rec.getByText("640 mbar (out of range)").waitFor();
    await rec.getByRole("img", { name: "Photo for this step" }).waitFor();
    await g.page.evaluate(() => window.scrollTo(0, 0));
    await screenshot(g.page, "run-record-safety-officer");
    await g.page.emulateMedia({ media: "print" });
    await screenshot(g.page, "run-record-print");
    await g.page.emulateMedia({ media: "screen" });

    expect(t.errors).toEqual([]);
    expect(g.errors).toEqual([]);
  }, 600_000);

  it("hands over a shift with a signature and the incoming technician accepts with theirs; the admin saves a new template version", async () => {
    const out = await tablet(DEMO_USERS.tomasz.email, { ready: true });
    const inc = await tablet(DEMO_USERS.priya.email, { ready: true });
    for (const [c, who] of [
      [out, "tomasz"],
      [inc, "priya"],
    ] as const) {
      await c.page.goto("/procedures");
      await c.page.getByRole("button", { name: /^(Set|Change) PIN$/ }).click();
      await c.page.getByLabel("Your password").fill(DEMO_PASSWORD);
      await c.page.getByLabel("New PIN (6–12 digits)").fill(PIN);
      await c.page.getByLabel("PIN again").fill(PIN);
      await c.page.getByRole("button", { name: "Save PIN" }).click();
      await c.page.getByRole("status").filter({ hasText: "Signing PIN set on this tablet." }).waitFor();
      mark(`PIN set for ${who}`);
    }

    const note = `Plover steady; next transfer Thursday (${Date.now().toString(36)})`;
    await out.page.goto("/handover?cryostat=plover");
    await out.page.getByRole("heading", { level: 1, name: "Shift handover — Plover" }).waitFor();
    // The summary comes from the log: the demo history has helium levels and a field on Plover.
    await out.page.getByText("Helium", { exact: true }).waitFor();
    await out.page.getByLabel("Note for the next shift").fill(note);
    await out.page.getByLabel("Handed over to").selectOption({ label: "Priya Lindqvist" });
    await signWithPin(out.page, "✍ Hand over and sign", "Sign: Handed over");
    const mine = out.page.locator("[data-handover]").filter({ hasText: note });
    await mine.getByText("Handed over — Tomasz Okafor").waitFor();
    await waitPending(out.page, 0);
    await out.page.evaluate(() => window.scrollTo(0, 0));
    await screenshot(out.page, "handover-given");

    await inc.page.goto("/handover?cryostat=plover");
    const theirs = inc.page.locator("[data-handover]").filter({ hasText: note });
    await theirs.waitFor({ timeout: 60_000 });
    await theirs.getByRole("button", { name: "✍ Accept and sign" }).click();
    const dialog = inc.page.getByRole("dialog");
    const box = (await dialog.getByRole("img", { name: "Signature pad" }).boundingBox())!;
    await inc.page.mouse.move(box.x + 40, box.y + 100);
    await inc.page.mouse.down();
    await inc.page.mouse.move(box.x + 200, box.y + 60, { steps: 12 });
    await inc.page.mouse.up();
    await dialog.getByLabel("Signing PIN").fill(PIN);
    await dialog.getByRole("button", { name: "Sign: Accepted" }).click();
    await theirs.getByText("Accepted — Priya Lindqvist").waitFor();
    await theirs.getByText("Accepted", { exact: true }).waitFor();
    await waitPending(inc.page, 0);
    mark("handover accepted");

    // The facility admin edits a template: saving makes version 2, version 1 stays.
    const admin = await tablet(DEMO_USERS.ines.email, { ready: true });
    await admin.page.goto("/admin/templates");
    await admin.page.getByRole("button", { name: "Edit Liquid helium transfer" }).click();
    await admin.page.getByLabel("Title", { exact: true }).fill("Liquid helium transfer (rev. B)");
    await admin.page.getByRole("button", { name: "Save as version 2" }).click();
    const panel = admin.page
      .locator("section")
      .filter({ has: admin.page.getByRole("heading", { name: "Liquid helium transfer (rev. B)" }) });
    await panel.getByText("version 2").waitFor();
    await panel.getByText(/v2 .* · v1 /).waitFor();
    await admin.page.evaluate(() => window.scrollTo(0, 0));
    await screenshot(admin.page, "admin-templates");

    expect(out.errors).toEqual([]);
    expect(inc.errors).toEqual([]);
    expect(admin.errors).toEqual([]);
  }, 600_000);
});
