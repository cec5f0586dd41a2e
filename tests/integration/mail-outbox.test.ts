// E-mail events: each event is queued once (the event key), whatever the number of pushes or ticks;
// the fake transport renders the message with nodemailer and marks it sent.
import { describe, expect, it } from "vitest";
import { appendEntries } from "@/db/queries/entries";
import {
  deliverPending,
  enqueueMail,
  listMail,
  mailTick,
  queueHeliumForecasts,
  queueWaitingHandovers,
} from "@/db/queries/mail";
import { mailOutbox } from "@/db/schema";
import type { MailTransport } from "@/lib/mail/messages";
import { fakeTransport } from "@/server/mail/transport";
import { entryBuilder } from "../support/entries";
import { grace, tomasz } from "../support/users";
import { DEMO_NOW, freshDb } from "./fixture";

/** Tomasz's entries on Plover, written now unless the call says when. */
const entry = entryBuilder({ cryostatId: "plover" });

describe("mail outbox", () => {
  it("queues a message once per event key", async () => {
    const db = await freshDb();
    const m = { eventKey: "test:1", to: ["a@larchmere.example"], subject: "S", body: "B" };
    expect(await enqueueMail(db, m)).toBe(true);
    expect(await enqueueMail(db, { ...m, subject: "different" })).toBe(false);
    const rows = await db.select().from(mailOutbox);
    expect(rows.map((r) => r.subject)).toEqual(["S"]);
  });

  it("mails a pushed quench once to the safety officer and admin, even when pushed again", async () => {
    const db = await freshDb({ seeded: true });
    const before = (await listMail(db)).length;
    const q = entry({
      kind: "quench",
      payload: {
        at: new Date().toISOString(),
        fieldT: 6,
        currentA: 50,
        heliumLostLitres: 20,
        actions: "Left the room.",
      },
    });
    await appendEntries(db, tomasz, [q]);
    await appendEntries(db, tomasz, [q]); // a retried push
    const mails = (await listMail(db)).filter((m) => m.eventKey === `quench:${q.id}`);
    expect(mails).toHaveLength(1);
    expect(mails[0]!.to).toContain("grace@larchmere.example");
    expect(mails[0]!.to).toContain("ines@larchmere.example");
    expect(mails[0]!.subject).toMatch(/Quench on Plover/);
    expect((await listMail(db)).length).toBe(before + 1);
  });

  it("mails a needs-action finding once, not an acceptable one", async () => {
    const db = await freshDb({ seeded: true });
    const t = entry({
      kind: "incident",
      payload: { title: "Frost on the neck", description: "Ice on the relief valve.", actions: "Cleared." },
    });
    await appendEntries(db, tomasz, [t]);
    const ok = entry({
      kind: "audit.finding",
      authorId: grace.id,
      payload: { targetEntryId: t.id, verdict: "acceptable", findings: "Fine.", flags: [] },
    });
    const bad = entry({
      kind: "audit.finding",
      authorId: grace.id,
      payload: { targetEntryId: t.id, verdict: "needs_action", findings: "Valve needs a check.", flags: [] },
    });
    const res = await appendEntries(db, grace, [ok, bad]);
    expect(res.rejected).toEqual([]);
    await appendEntries(db, grace, [bad]);
    const mails = await listMail(db);
    expect(mails.filter((m) => m.eventKey.startsWith("finding-needs-action:"))).toHaveLength(1);
    expect(mails.find((m) => m.eventKey === `finding-needs-action:${bad.id}`)?.to).toContain(
      "tomasz@larchmere.example",
    );
    expect(mails.some((m) => m.eventKey === `finding-needs-action:${ok.id}`)).toBe(false);
  });

  it("mails a handover waiting for acceptance once, and none once it is accepted", async () => {
    const db = await freshDb({ seeded: true });
    const now = new Date();
    const h = entry(
      {
        kind: "handover",
        payload: { summary: { stages: [], openRuns: [], openIssues: [] }, note: "Plover steady.", toUserId: "u-priya" },
      },
      new Date(now.getTime() - 30 * 60_000),
    );
    await appendEntries(db, tomasz, [h]);
    expect(await queueWaitingHandovers(db, { now })).toBe(1);
    expect(await queueWaitingHandovers(db, { now })).toBe(0);
    const mail = (await listMail(db)).find((m) => m.eventKey === `handover-waiting:${h.id}`);
    expect(mail?.to).toBe("priya@larchmere.example");
    // A fresh handover (within the grace period) is not mailed yet.
    const h2 = entry(
      {
        kind: "handover",
        payload: { summary: { stages: [], openRuns: [], openIssues: [] }, note: "x", toUserId: "u-priya" },
      },
      now,
    );
    await appendEntries(db, tomasz, [h2]);
    expect(await queueWaitingHandovers(db, { now })).toBe(0);
  });

  it("warns once per fill when the helium forecast reaches the minimum within the warning days", async () => {
    const db = await freshDb({ seeded: true });
    // Wren: 60 L at 0.6 L/%, minimum 20 %. Fill to 40 % then lose 3 %/day: 20 % in ~6.7 days from the fill.
    const t0 = DEMO_NOW + 3 * 86_400_000;
    const fill = entry(
      {
        cryostatId: "wren",
        kind: "transfer",
        payload: {
          supplyDewar: "D-100-C",
          peoplePresent: ["u-tomasz", "u-priya"],
          ppeConfirmed: true,
          oxygenMonitorChecked: true,
          oxygenLowestPercent: 20.7,
          levelBeforePercent: 22,
          levelAfterPercent: 40,
          suppliedLitres: 15,
          suppliedBy: "level",
          gainedLitres: 10.8,
          durationMin: 20,
          anomalies: "",
        },
      },
      new Date(t0),
    );
    const levels = [1, 2, 3].map((d) =>
      entry(
        { cryostatId: "wren", kind: "helium.level", payload: { percent: 40 - 3 * d } },
        new Date(t0 + d * 86_400_000),
      ),
    );
    // Pushed as the last level is read (the server refuses entries dated ahead of its clock).
    const { rejected } = await appendEntries(db, tomasz, [fill, ...levels], { now: new Date(t0 + 3 * 86_400_000) });
    expect(rejected).toEqual([]);
    // Only Wren's warnings count here: the demo's other cryostats run on with no transfer after
    // the demo history ends, so their own forecasts may warn too.
    const wrenMail = async () => (await listMail(db)).filter((m) => m.eventKey.startsWith("helium-forecast:wren:"));
    // Day 3: 31 %, ~3.7 days left → beyond the 3-day warning: no mail.
    await queueHeliumForecasts(db, { now: new Date(t0 + 3 * 86_400_000) });
    expect(await wrenMail()).toHaveLength(0);
    // Day 4.5: ~2.2 days left → one warning, and no second one on the next tick.
    await queueHeliumForecasts(db, { now: new Date(t0 + 4.5 * 86_400_000) });
    expect(await wrenMail()).toHaveLength(1);
    expect(await queueHeliumForecasts(db, { now: new Date(t0 + 5 * 86_400_000) })).toBe(0);
    expect(await wrenMail()).toHaveLength(1);
    const mail = (await listMail(db)).find((m) => m.eventKey === `helium-forecast:wren:${fill.id}`);
    expect(mail?.subject).toMatch(/Wren: helium reaches the minimum in about 2\.2 days/);
    expect(mail?.body).toMatch(/Estimate/);
  });

  it("delivers each queued message once through nodemailer and keeps failures for a retry", async () => {
    const db = await freshDb();
    await enqueueMail(db, { eventKey: "e:1", to: ["a@larchmere.example"], subject: "One", body: "Body" });
    const sent: string[] = [];
    const real = fakeTransport();
    const counting: MailTransport = {
      kind: "fake",
      send: async (m) => {
        sent.push(m.subject);
        return real.send(m);
      },
    };
    expect(await deliverPending(db, counting)).toEqual({ sent: 1, failed: 0 });
    expect(await deliverPending(db, counting)).toEqual({ sent: 0, failed: 0 });
    expect(sent).toEqual(["One"]);
    await enqueueMail(db, { eventKey: "e:2", to: ["b@larchmere.example"], subject: "Two", body: "Body" });
    const failing: MailTransport = { kind: "smtp", send: async () => Promise.reject(new Error("connection refused")) };
    expect(await deliverPending(db, failing)).toEqual({ sent: 0, failed: 1 });
    const row = (await listMail(db)).find((m) => m.eventKey === "e:2");
    expect(row?.sentAt).toBeNull();
    expect(row?.error).toMatch(/connection refused/);
    const tick = await mailTick(db, counting);
    expect(tick.sent).toBe(1);
  });
});
