// The mail outbox: queueing each event's message once (the unique event key makes a repeat a
// no-op), the projector that queues mail for pushed quenches and needs-action findings in the same
// transaction as the entries, the periodic checks (handovers waiting, helium forecast), delivery,
// and the admin's read-only list. Must not import db/queries/entries.ts (projections import this).
import "server-only";
import { and, asc, desc, eq, gt, inArray, isNull, lt, sql } from "drizzle-orm";
import type { Db } from "@/db/client";
import { cryostats, entries, facilityRules, mailOutbox, type Role, signatures, users } from "@/db/schema";
import { boilOffRate, forecastMinimumLevel, litresFromLevel } from "@/lib/cryo";
import { env } from "@/lib/env";
import {
  findingNeedsActionMail,
  handoverWaitingMail,
  heliumForecastMail,
  type MailMessage,
  type MailRow,
  type MailTransport,
  quenchMail,
} from "@/lib/mail/messages";
import { payloadOf } from "@/lib/schemas/entry";
import type { Projector } from "./log-check";
import { toStoredRow } from "./stored";

/** Queue a message; false when that event's message was already queued. */
export async function enqueueMail(db: Db, m: MailMessage): Promise<boolean> {
  if (!m.to.length) return false;
  const inserted = await db
    .insert(mailOutbox)
    .values({ eventKey: m.eventKey, to: [...new Set(m.to)].join(", "), subject: m.subject, body: m.body })
    .onConflictDoNothing({ target: mailOutbox.eventKey })
    .returning({ id: mailOutbox.id });
  return inserted.length > 0;
}

async function emailsOf(db: Db, { roles, ids }: { roles?: Role[]; ids?: string[] }): Promise<string[]> {
  const out: string[] = [];
  if (roles?.length)
    out.push(
      ...(
        await db
          .select({ email: users.email })
          .from(users)
          .where(and(inArray(users.role, roles), eq(users.active, true)))
      ).map((u) => u.email),
    );
  if (ids?.length)
    out.push(
      ...(
        await db
          .select({ email: users.email })
          .from(users)
          .where(and(inArray(users.id, ids), eq(users.active, true)))
      ).map((u) => u.email),
    );
  return [...new Set(out)];
}

async function nameOf(db: Db, id: string): Promise<string> {
  const [u] = await db.select({ name: users.name }).from(users).where(eq(users.id, id));
  return u?.name ?? id;
}

async function cryostatName(db: Db, id: string | null | undefined): Promise<string> {
  if (!id) return "the facility";
  const [c] = await db.select({ name: cryostats.name }).from(cryostats).where(eq(cryostats.id, id));
  return c?.name ?? id;
}

/** Projector: mail for a quench (to the safety officers and admins) and for a needs-action finding. */
export const mailProjector: Projector = async (db, rows) => {
  for (const r of rows) {
    if (r.kind === "quench") {
      const p = r.payload;
      await enqueueMail(
        db,
        quenchMail({
          entryId: r.id,
          cryostatName: await cryostatName(db, r.cryostatId),
          at: p.at,
          fieldT: p.fieldT,
          heliumLostLitres: p.heliumLostLitres ?? null,
          oxygenLowestPercent: p.oxygenLowestPercent,
          actions: p.actions,
          reportedBy: await nameOf(db, r.authorId),
          to: await emailsOf(db, { roles: ["safety_officer", "facility_admin"] }),
        }),
      );
    } else if (r.kind === "audit.finding" && r.payload.verdict === "needs_action") {
      const p = r.payload;
      const [target] = await db.select().from(entries).where(eq(entries.id, p.targetEntryId));
      await enqueueMail(
        db,
        findingNeedsActionMail({
          findingId: r.id,
          targetKind: target?.kind ?? "record",
          cryostatName: await cryostatName(db, target?.cryostatId ?? r.cryostatId),
          targetAt: target ? target.recordedAt.toISOString() : r.recordedAt,
          officer: await nameOf(db, r.authorId),
          findings: p.findings,
          flags: p.flags,
          to: await emailsOf(db, { roles: ["facility_admin"], ids: target ? [target.authorId] : [] }),
        }),
      );
    }
  }
};

/** Handovers to a named person that nobody has accepted yet (recent ones only). */
export async function queueWaitingHandovers(
  db: Db,
  { now = new Date(), withinMs = 2 * 86_400_000, graceMs = 15 * 60_000 } = {},
): Promise<number> {
  const since = new Date(now.getTime() - withinMs);
  // A grace period: most handovers are accepted on the spot, and those need no mail.
  const until = new Date(now.getTime() - graceMs);
  const list = await db
    .select()
    .from(entries)
    .where(
      and(
        eq(entries.kind, "handover"),
        gt(entries.recordedAt, since),
        lt(entries.recordedAt, until),
        sql`${entries.payload} ? 'toUserId'`,
      ),
    )
    .orderBy(asc(entries.seq));
  let queued = 0;
  for (const h of list.map(toStoredRow)) {
    const p = payloadOf(h, "handover");
    if (!p?.toUserId) continue;
    const [acc] = await db
      .select({ id: signatures.entryId })
      .from(signatures)
      .where(and(eq(signatures.signedEntryId, h.id), eq(signatures.meaning, "accepted")))
      .limit(1);
    if (acc) continue;
    const ok = await enqueueMail(
      db,
      handoverWaitingMail({
        handoverId: h.id,
        cryostatName: await cryostatName(db, h.cryostatId),
        from: await nameOf(db, h.authorId),
        at: h.recordedAt,
        note: p.note,
        to: await emailsOf(db, { ids: [p.toUserId] }),
      }),
    );
    if (ok) queued++;
  }
  return queued;
}

/** Each cryostat whose helium is forecast to reach its minimum within the facility's warning days. */
export async function queueHeliumForecasts(db: Db, { now = new Date() } = {}): Promise<number> {
  const [rules] = await db.select().from(facilityRules).orderBy(desc(facilityRules.version)).limit(1);
  if (!rules) return 0;
  let queued = 0;
  for (const c of await db.select().from(cryostats)) {
    const reservoir = c.config.reservoir;
    if (!reservoir) continue;
    const minimumPercent = rules.values.minHeliumPercent[c.id] ?? reservoir.minimumPercent;
    const [lastTransfer] = await db
      .select()
      .from(entries)
      .where(and(eq(entries.cryostatId, c.id), eq(entries.kind, "transfer"), isNull(entries.supersedes)))
      .orderBy(desc(entries.recordedAt))
      .limit(1);
    const levels = await db
      .select()
      .from(entries)
      .where(
        and(
          eq(entries.cryostatId, c.id),
          eq(entries.kind, "helium.level"),
          lastTransfer ? gt(entries.recordedAt, lastTransfer.recordedAt) : undefined,
        ),
      )
      .orderBy(asc(entries.recordedAt));
    if (!levels.length) continue;
    const points: { timeMs: number; litres: number }[] = [];
    try {
      const filled = lastTransfer ? payloadOf(toStoredRow(lastTransfer), "transfer") : undefined;
      if (lastTransfer && filled)
        points.push({
          timeMs: lastTransfer.recordedAt.getTime(),
          litres: litresFromLevel(filled.levelAfterPercent, reservoir.calibration),
        });
      for (const l of levels) {
        const level = payloadOf(toStoredRow(l), "helium.level");
        if (level)
          points.push({
            timeMs: l.recordedAt.getTime(),
            litres: litresFromLevel(level.percent, reservoir.calibration),
          });
      }
      const rate = boilOffRate(points);
      const minLitres = litresFromLevel(minimumPercent, reservoir.calibration);
      const f = forecastMinimumLevel(rate, minLitres, now.getTime());
      if (!f.forecast || f.daysLeft > rules.values.forecastWarnDays) continue;
      const ok = await enqueueMail(
        db,
        heliumForecastMail({
          cryostatId: c.id,
          cryostatName: c.name,
          anchorEntryId: lastTransfer?.id ?? levels[0]!.id,
          daysLeft: f.daysLeft,
          reachAt: f.reachDate.toISOString(),
          minimumPercent,
          litresPerDay: rate.litresPerDay,
          warnDays: rules.values.forecastWarnDays,
          to: await emailsOf(db, { roles: ["technician", "facility_admin"] }),
        }),
      );
      if (ok) queued++;
    } catch {
      // Too few readings, or a refill inside the history: no forecast this time.
    }
  }
  return queued;
}

/** Send what is queued; a failure is written on the row and retried on the next tick. */
export async function deliverPending(
  db: Db,
  transport: MailTransport,
  { limit = 50 } = {},
): Promise<{ sent: number; failed: number }> {
  const pending = await db
    .select()
    .from(mailOutbox)
    .where(isNull(mailOutbox.sentAt))
    .orderBy(asc(mailOutbox.createdAt))
    .limit(limit);
  let sent = 0;
  let failed = 0;
  for (const m of pending) {
    try {
      await transport.send({ from: env().MAIL_FROM, to: m.to, subject: m.subject, text: m.body });
      await db.update(mailOutbox).set({ sentAt: new Date(), error: null }).where(eq(mailOutbox.id, m.id));
      sent++;
    } catch (e) {
      await db
        .update(mailOutbox)
        .set({ error: String((e as Error).message).slice(0, 500) })
        .where(eq(mailOutbox.id, m.id));
      failed++;
    }
  }
  return { sent, failed };
}

export type { MailRow };

export async function listMail(db: Db, { limit = 200 } = {}): Promise<MailRow[]> {
  return db.select().from(mailOutbox).orderBy(desc(mailOutbox.createdAt)).limit(limit);
}

/** The periodic checks and delivery. Safe to run as often as wanted: each event mails once. */
export async function mailTick(db: Db, transport: MailTransport, { now = new Date() } = {}) {
  const handovers = await queueWaitingHandovers(db, { now });
  const forecasts = await queueHeliumForecasts(db, { now });
  const delivery = await deliverPending(db, transport);
  return { handovers, forecasts, ...delivery };
}
