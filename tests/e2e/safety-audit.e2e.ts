// The safety side end to end, in Chromium against the production build: the admin uploads the
// facility's rules document (a non-PDF and an oversized file are refused with clear messages); a
// technician records a one-person transfer with no oxygen reading while offline; after sync the
// safety officer's queue shows it with both flags; the officer signs a finding (stylus mark and
// password); the CSV export contains it; the PDF report opens (first page rendered to PNG when
// pdftoppm is installed). The cautions show the facility's values on the transfer and quench
// screens, and the rules document opens from them.
import { execFileSync } from "node:child_process";
import { existsSync, mkdirSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import { PDFDocument, StandardFonts } from "pdf-lib";
import { describe, expect, inject, it } from "vitest";
import { SCREENSHOT_DIR, screenshot, useTablets, waitPending } from "./support/browser";
import { DEMO_PASSWORD, DEMO_USERS } from "./support/demo-users";

const baseURL = inject("baseURL");
const tablet = useTablets(baseURL);

async function rulesPdf(): Promise<Uint8Array> {
  const doc = await PDFDocument.create();
  const font = await doc.embedFont(StandardFonts.Helvetica);
  const page = doc.addPage();
  page.drawText("Low-Temperature Hall B-014 - local cryogen rules (demo)", { x: 50, y: 780, size: 14, font });
  return doc.save();
}

describe("facility rules document", () => {
  it("refuses a non-PDF and an oversized file with a clear message, then accepts a PDF", async () => {
    const { page, errors } = await tablet(DEMO_USERS.ines.email);
    await page.goto("/admin/rules");
    await page.getByRole("heading", { level: 1, name: "Facility rules" }).waitFor();
    const upload = page.getByLabel(/Upload a new PDF/);
    await upload.waitFor();

    // A PNG named like a PDF: refused by its content.
    await upload.setInputFiles({
      name: "rules.pdf",
      mimeType: "application/pdf",
      buffer: Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 1, 2, 3, 4]),
    });
    await page.getByRole("alert").filter({ hasText: '"rules.pdf" is not a PDF' }).waitFor();
    await screenshot(page, "safety-rules-upload-not-pdf");

    // Over 10 MB: refused by the server (sent directly; the page also checks the size before sending).
    const big = Buffer.alloc(10 * 1024 * 1024 + 10, 0x20);
    big.write("%PDF-1.7\n", 0, "latin1");
    const res = await page.request.post("/api/rules/document", {
      headers: { "content-type": "application/octet-stream", origin: baseURL, "x-rimelog-file-name": "huge.pdf" },
      data: big,
    });
    expect(res.status()).toBe(413);
    expect(((await res.json()) as { error: { message: string } }).error.message).toMatch(
      /"huge.pdf" is 10.0 MB; the limit is 10 MB/,
    );

    // A real PDF: in force, as an audited rules change.
    await upload.setInputFiles({
      name: "b014-cryogen-rules.pdf",
      mimeType: "application/pdf",
      buffer: Buffer.from(await rulesPdf()),
    });
    await page
      .getByRole("status")
      .filter({ hasText: '"b014-cryogen-rules.pdf" is now the facility\'s rules document' })
      .waitFor();
    await screenshot(page, "safety-rules-admin");
    const facility = await page.request.get("/api/rules");
    const body = (await facility.json()) as { rules: { version: number; document: { fileName: string } | null } };
    expect(body.rules.document?.fileName).toBe("b014-cryogen-rules.pdf");
    expect(body.rules.version).toBeGreaterThan(1);
    expect(errors).toEqual([]);
  });
});

describe("a flagged transfer from offline to a signed audit", () => {
  it("is recorded offline, queued with both flags, signed by the officer, exported to CSV and PDF", async () => {
    const tag = `audit-e2e-${Date.now().toString(36)}`;
    const tech = await tablet(DEMO_USERS.tomasz.email);
    await tech.page.evaluate(async () => {
      await navigator.serviceWorker.ready;
    });
    await tech.page.waitForFunction(() => navigator.serviceWorker.controller !== null, undefined, { timeout: 30_000 });
    await waitPending(tech.page, 0);

    // Online once: the transfer page and the facility's rules reach the tablet.
    await tech.page.goto("/transfers/new");
    const caution = tech.page.locator('aside[data-caution="transfer"]');
    await caution.locator('[data-fact="oxygen"]').filter({ hasText: "19.5 %" }).waitFor();
    await tech.page
      .getByLabel("Cryostat", { exact: true })
      .locator("option", { hasText: "Plover" })
      .waitFor({ state: "attached" });

    // The network goes; the form is reloaded from the service worker and still works.
    await tech.context.setOffline(true);
    await tech.page.reload();
    await tech.page.getByRole("heading", { level: 1, name: "Record a helium transfer" }).waitFor();
    await tech.page.getByLabel("Cryostat", { exact: true }).selectOption({ label: "Plover" });
    await caution.locator('[data-fact="oxygen"]').filter({ hasText: "Oxygen alarm at 19.5 %" }).waitFor();
    expect(await caution.locator('[data-fact="ppe"]').innerText()).toContain("Face shield");
    expect(await caution.locator('[data-fact="two-person"]').innerText()).toMatch(/Two people must be present/);
    expect(await caution.locator("[data-deferral]").innerText()).toMatch(
      /training, the safety officer .* equipment maker's instructions/,
    );
    await tech.page.getByLabel("Supply dewar").fill("D-250-B");
    await tech.page.getByLabel(/^PPE worn/).check();
    // Oxygen monitor not checked, no reading; only the technician present (pre-ticked).
    await tech.page.getByLabel("Level before (%)").fill("31");
    await tech.page.getByLabel("Level after (%)").fill("80");
    await tech.page.getByLabel("Litres taken from the supply").fill("68");
    await tech.page.getByLabel("Duration (min)").fill("35");
    await tech.page.getByLabel("Anomalies").fill(`Second person called away (${tag})`);
    await tech.page.locator('[data-figure="efficiency"]').waitFor();
    expect(
      await tech.page
        .getByText("The facility's rules require two people present for a transfer.", { exact: true })
        .isVisible(),
    ).toBe(true);
    await screenshot(tech.page, "safety-transfer-offline");
    await tech.page.getByRole("button", { name: "Save transfer" }).click();
    await tech.page.getByRole("status").filter({ hasText: "Transfer saved on this tablet" }).waitFor();
    await waitPending(tech.page, 1);

    // Back online: the transfer reaches the server.
    await tech.context.setOffline(false);
    await waitPending(tech.page, 0, 60_000);

    // The safety officer's queue shows it with both flags.
    const officer = await tablet(DEMO_USERS.grace.email);
    const q = await officer.page.request.get("/api/audit/queue");
    expect(q.status()).toBe(200);
    const queue = (await q.json()) as {
      items: { entry: { id: string; payload: { anomalies?: string } }; flags: { code: string }[] }[];
    };
    const item = queue.items.find((i) => i.entry.payload.anomalies?.includes(tag));
    expect(item).toBeDefined();
    const id = item!.entry.id;
    expect(item!.flags.map((f) => f.code)).toEqual(expect.arrayContaining(["single_person", "oxygen_check_missing"]));

    await officer.page.goto("/audit");
    const row = officer.page.locator(`tr[data-record="${id}"]`);
    await row.waitFor();
    await row.locator('[data-flag="single_person"]').waitFor();
    await row.locator('[data-flag="oxygen_check_missing"]').waitFor();
    await screenshot(officer.page, "safety-audit-queue");

    // The officer opens it, writes a finding, marks it as needing action and signs.
    await row.getByRole("link", { name: /^Open/ }).click();
    await officer.page.getByRole("heading", { level: 2, name: "Helium transfer on Plover" }).waitFor();
    await officer.page.locator('[data-flag="single_person"]').first().waitFor();
    await officer.page.getByRole("radio", { name: "Needs action" }).click();
    await officer.page
      .getByLabel("Findings")
      .fill("Transfer done alone and without the oxygen monitor. Brief the team on the two-person rule.");
    await officer.page.getByRole("button", { name: "Sign the finding" }).click();
    const dialog = officer.page.getByRole("dialog", { name: "Sign the audit finding" });
    await dialog.waitFor();
    const pad = dialog.getByRole("img", { name: "Signature pad" });
    const box = (await pad.boundingBox())!;
    await officer.page.mouse.move(box.x + 40, box.y + 120);
    await officer.page.mouse.down();
    for (let k = 1; k <= 12; k++)
      await officer.page.mouse.move(box.x + 40 + k * 25, box.y + 120 - Math.sin(k / 2) * 50, { steps: 3 });
    await officer.page.mouse.up();
    await dialog.getByRole("radio", { name: "Password (online)" }).click();
    await dialog.getByLabel("Password").fill(DEMO_PASSWORD);
    await dialog.getByRole("button", { name: "Sign: Audited" }).click();
    await officer.page.getByRole("status").filter({ hasText: "Finding signed: needs action." }).waitFor();
    await officer.page.locator("[data-finding] [data-signature]").first().waitFor();
    expect(await officer.page.locator("[data-finding]").first().innerText()).toMatch(
      /Audited — Dr\. Grace Oyelaran[\s\S]*identity confirmed with password/,
    );
    await screenshot(officer.page, "safety-audit-signed");

    // Out of the queue now.
    const after = (await (await officer.page.request.get("/api/audit/queue")).json()) as {
      items: { entry: { id: string } }[];
    };
    expect(after.items.some((i) => i.entry.id === id)).toBe(false);

    // CSV: the record with its flags and the officer's signature manifestation.
    const csvRes = await officer.page.request.get("/api/exports/transfers?cryostat=plover&flag=single_person");
    expect(csvRes.status()).toBe(200);
    expect(csvRes.headers()["content-type"]).toMatch(/text\/csv/);
    const csv = await csvRes.text();
    const line = csv.split("\r\n").find((l) => l.startsWith(id) || l.startsWith(`\ufeff${id}`));
    expect(line).toBeDefined();
    expect(line).toContain("Single person");
    expect(line).toContain("Oxygen check missing");
    expect(line).toContain("needs_action");
    expect(line).toMatch(/audited by Dr\. Grace Oyelaran \(safety_officer\) at \d{4}-/);

    // PDF report of the period: opens with pdf-lib; first page rendered to PNG to look at.
    const today = new Date().toISOString().slice(0, 10);
    const pdfRes = await officer.page.request.get(
      `/api/exports/report?from=${new Date(Date.now() - 35 * 86_400_000).toISOString().slice(0, 10)}&to=${today}`,
    );
    expect(pdfRes.status()).toBe(200);
    expect(pdfRes.headers()["content-type"]).toBe("application/pdf");
    const pdf = await pdfRes.body();
    expect(pdf.subarray(0, 5).toString("latin1")).toBe("%PDF-");
    const doc = await PDFDocument.load(pdf);
    expect(doc.getPageCount()).toBeGreaterThan(1);
    expect(doc.getTitle()).toMatch(/^Audit report /);
    mkdirSync(SCREENSHOT_DIR, { recursive: true });
    const pdfPath = join(SCREENSHOT_DIR, "safety-audit-report.pdf");
    writeFileSync(pdfPath, pdf);
    if (existsSync("/usr/bin/pdftoppm")) {
      execFileSync("/usr/bin/pdftoppm", [
        "-png",
        "-r",
        "80",
        "-f",
        "1",
        "-l",
        "1",
        "-singlefile",
        pdfPath,
        join(SCREENSHOT_DIR, "safety-audit-report-page1"),
      ]);
      expect(existsSync(join(SCREENSHOT_DIR, "safety-audit-report-page1.png"))).toBe(true);
    }
    expect(tech.errors).toEqual([]);
    expect(officer.errors).toEqual([]);
  });
});

describe("cautions where the work happens", () => {
  it("show the facility's values on the transfer and quench screens, and the rules document opens from them", async () => {
    const { page, errors } = await tablet(DEMO_USERS.priya.email);
    for (const [path, topic] of [
      ["/transfers/new", "transfer"],
      ["/quench/new", "quench"],
    ] as const) {
      await page.goto(path);
      const caution = page.locator(`aside[data-caution="${topic}"]`);
      await caution.locator('[data-fact="oxygen"]').filter({ hasText: "19.5 %" }).waitFor();
      expect(await caution.locator('[data-fact="contacts"]').innerText()).toContain("+00 555 0142");
      await caution.getByRole("button", { name: "Read the cautions" }).click();
      const text = await caution.innerText();
      if (topic === "transfer") expect(text).toMatch(/Never seal a cryogen vessel/);
      if (topic === "quench") expect(text).toMatch(/boils off liquid helium/);
      const link = caution.getByRole("link", { name: /Open the facility's rules document/ });
      await link.waitFor();
      const href = await link.getAttribute("href");
      const doc = await page.request.get(href!);
      expect(doc.status()).toBe(200);
      expect(doc.headers()["content-type"]).toBe("application/pdf");
      expect((await doc.body()).subarray(0, 5).toString("latin1")).toBe("%PDF-");
      await screenshot(page, `safety-caution-${topic}`);
    }
    expect(errors).toEqual([]);
  });
});
