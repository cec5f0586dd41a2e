// The safety officer's audit: the queue of transfers, quenches and incidents not yet audited, each
// with its automatic flags; one record with its signatures, findings and chain state; the table
// of all transfers with filters; and the check that a finding names an auditable record.
// Must not import db/queries/entries.ts (projections import this module).
import "server-only";
import { and, asc, desc, eq, gte, inArray, lte, sql } from "drizzle-orm";
import type { Db } from "@/db/client";
import { cryostats, type EntryRow, entries, facilityRules, signatures, users } from "@/db/schema";
import { quenchFigures, transferFigures } from "@/lib/audit/figures";
import { type AuditRecord, type FlagCode, flagsFor } from "@/lib/audit/flags";
import { personLabel } from "@/lib/record/people";
import { type EntryInput, isKind, payloadOf } from "@/lib/schemas/entry";
import type { FacilityRulesValues } from "@/lib/schemas/rules";
import { chainOf } from "@/lib/sync/hash";
import { chainBreaks } from "./chain";
import { type Check, forKinds, type LogCheck } from "./log-check";
import { runFlagsByTransfer } from "./run-transfer";
import { toStoredRow } from "./stored";

export const AUDITED_KINDS = ["transfer", "quench", "incident"] as const;

/** A finding must name a stored transfer, quench or incident of the same cryostat. */
export const auditFindingCheck: Check<EntryInput<"audit.finding">> = async (db, e, batch) => {
  const targetId = e.payload.targetEntryId;
  const inBatch = batch.get(targetId);
  const [row] = inBatch
    ? []
    : await db
        .select({ kind: entries.kind, cryostatId: entries.cryostatId })
        .from(entries)
        .where(eq(entries.id, targetId));
  const target = inBatch ?? row;
  if (!target) return { code: "bad_request:audit", message: "The audited record is not on the server." };
  if (!(AUDITED_KINDS as readonly string[]).includes(target.kind))
    return {
      code: "bad_request:audit",
      message: `A ${target.kind} entry is not audited; findings are for transfers, quenches and incidents.`,
    };
  if (target.cryostatId !== e.cryostatId)
    return { code: "bad_request:audit", message: "A finding belongs to the same cryostat as the record it audits." };
  return null;
};

/** An "audited" signature signs a finding (not the record itself). */
export const auditSignatureCheck: Check<EntryInput<"signature">> = async (db, e, batch) => {
  const p = e.payload;
  if (p.meaning !== "audited") return null;
  const inBatch = batch.get(p.signedEntryId);
  const [row] = inBatch
    ? []
    : await db.select({ kind: entries.kind }).from(entries).where(eq(entries.id, p.signedEntryId));
  const target = inBatch ?? row;
  if (target && target.kind !== "audit.finding")
    return {
      code: "bad_request:signature",
      message: "An audit signature signs the officer's finding, not the record itself.",
    };
  // Its proof is required by the record rules and checked in runs.ts, as for every signature.
  return null;
};

export const auditChecks: LogCheck[] = [
  forKinds(["audit.finding"], auditFindingCheck),
  forKinds(["signature"], auditSignatureCheck),
];

import type { CheckpointKeys } from "@/lib/audit/checkpoint";
import type { AuditItem, FindingView, SignatureView } from "@/lib/audit/types";

export type { AuditItem, FindingView, SignatureView };

async function rulesValues(db: Db): Promise<FacilityRulesValues | null> {
  const [r] = await db.select().from(facilityRules).orderBy(desc(facilityRules.version)).limit(1);
  return r?.values ?? null;
}

/** Everything about a set of auditable entries: names, signatures, findings, flags, figures. */
async function describeRecords(db: Db, rows: EntryRow[], { keys }: { keys: CheckpointKeys }): Promise<AuditItem[]> {
  if (!rows.length) return [];
  const rules = await rulesValues(db);
  const ids = rows.map((r) => r.id);
  const people = new Map((await db.select({ id: users.id, name: users.name }).from(users)).map((u) => [u.id, u.name]));
  const cryos = new Map((await db.select().from(cryostats)).map((c) => [c.id, c]));
  const sigRows = await db
    .select({ s: signatures, role: users.role, name: users.name, entry: entries })
    .from(signatures)
    .leftJoin(users, eq(users.id, signatures.signerId))
    .leftJoin(entries, eq(entries.id, signatures.entryId));
  const sigView = (x: (typeof sigRows)[number]): SignatureView => {
    const p = x.entry ? payloadOf(toStoredRow(x.entry), "signature") : undefined;
    return {
      entryId: x.s.entryId,
      signedEntryId: x.s.signedEntryId,
      meaning: x.s.meaning,
      signerId: x.s.signerId,
      // The name and role of the user record (the server checked the signature's own copy against it).
      signerName: x.name ?? p?.signerName ?? x.s.signerId,
      signerRole: x.role ?? p?.signerRole ?? "",
      signedAt: x.s.signedAt,
      signedHash: x.s.signedHash,
      confirmedBy: p?.confirmedBy ?? null,
      image: p?.image ?? null,
    };
  };
  const sigsBy = new Map<string, SignatureView[]>();
  for (const x of sigRows) {
    const list = sigsBy.get(x.s.signedEntryId) ?? [];
    list.push(sigView(x));
    sigsBy.set(x.s.signedEntryId, list);
  }
  const findingRows = await db
    .select()
    .from(entries)
    .where(and(eq(entries.kind, "audit.finding"), inArray(sql`${entries.payload}->>'targetEntryId'`, ids)))
    .orderBy(asc(entries.seq));
  const findingsBy = new Map<string, FindingView[]>();
  for (const f of findingRows.map(toStoredRow)) {
    if (!isKind(f, "audit.finding")) continue;
    const p = f.payload;
    const list = findingsBy.get(p.targetEntryId) ?? [];
    list.push({
      id: f.id,
      verdict: p.verdict,
      findings: p.findings,
      flags: p.flags,
      authorName: people.get(f.authorId) ?? f.authorId,
      recordedAt: f.recordedAt,
      signatures: sigsBy.get(f.id) ?? [],
    });
    findingsBy.set(p.targetEntryId, list);
  }
  const breaks = await chainBreaks(db, { keys });
  // Previous transfer per cryostat, for the boil-off in between.
  const transfers = (
    await db.select().from(entries).where(eq(entries.kind, "transfer")).orderBy(asc(entries.recordedAt))
  )
    .map(toStoredRow)
    .filter((t) => isKind(t, "transfer"));
  // Transfers made by a procedure run carry the run's flags (lib/procedures/transfer-record.ts).
  const runFlags = await runFlagsByTransfer(
    db,
    rows.filter((r) => r.kind === "transfer"),
  );

  // The records that corrections among these replace: kept, and shown beside the correction.
  const originalIds = rows.map((r) => r.supersedes).filter((x): x is string => Boolean(x));
  const originals = new Map(
    (originalIds.length ? await db.select().from(entries).where(inArray(entries.id, originalIds)) : []).map((r) => [
      r.id,
      toStoredRow(r),
    ]),
  );
  const correctsOf = (row: EntryRow): AuditItem["corrects"] => {
    const o = row.supersedes ? originals.get(row.supersedes) : undefined;
    if (!o) return null;
    return {
      entry: o,
      authorName: people.get(o.authorId) ?? o.authorId,
      peopleNames: (payloadOf(o, "transfer")?.peoplePresent ?? []).map((id) => personLabel(id, people)),
      signatures: sigsBy.get(o.id) ?? [],
    };
  };

  return rows.map((row) => {
    const entry = toStoredRow(row);
    const sigs = sigsBy.get(row.id) ?? [];
    const findings = findingsBy.get(row.id) ?? [];
    const signedFindings = findings.filter((f) => f.signatures.some((s) => s.meaning === "audited"));
    const rec: AuditRecord = {
      ...entry,
      signatures: sigs.filter((s) => s.meaning !== "audited"),
      run: runFlags.get(row.id) ?? null,
    };
    const flags = rules ? flagsFor(rec, { rules, chainBreakSeq: breaks.get(chainOf(row.cryostatId)) ?? null }) : [];
    const c = row.cryostatId ? cryos.get(row.cryostatId) : undefined;
    let figures: AuditItem["figures"] = null;
    try {
      if (entry.kind === "transfer") {
        const mine = transfers.filter((t) => t.cryostatId === row.cryostatId);
        const idx = mine.findIndex((t) => t.id === row.id);
        const prev = idx > 0 ? mine[idx - 1] : undefined;
        figures = transferFigures(entry.payload, {
          calibration: c?.config.reservoir?.calibration,
          previous: prev ? { levelAfterPercent: prev.payload.levelAfterPercent, at: prev.recordedAt } : null,
          at: entry.recordedAt,
        });
      } else if (entry.kind === "quench") {
        figures = quenchFigures(entry.payload, {
          calibration: c?.config.reservoir?.calibration,
          inductanceH: c?.config.magnet?.inductanceH,
          roomFreeVolumeM3: rules?.roomFreeVolumeM3,
        });
      }
    } catch {
      figures = null; // figures are a help, never a reason to hide the record
    }
    return {
      entry,
      corrects: correctsOf(row),
      cryostatName: c?.name ?? row.cryostatId ?? "Facility",
      authorName: people.get(row.authorId) ?? row.authorId,
      peopleNames: (payloadOf(entry, "transfer")?.peoplePresent ?? []).map((id) => personLabel(id, people)),
      flags,
      signatures: sigs,
      findings,
      verdict: signedFindings.at(-1)?.verdict ?? null,
      figures,
    };
  });
}

/** Latest version of each record: a correction stands in for what it supersedes (which it carries as `corrects`). */
function latestOnly(rows: EntryRow[]): EntryRow[] {
  const superseded = new Set(rows.map((r) => r.supersedes).filter(Boolean));
  return rows.filter((r) => !superseded.has(r.id));
}

export async function auditQueue(db: Db, { keys }: { keys: CheckpointKeys }): Promise<AuditItem[]> {
  const rows = latestOnly(
    await db
      .select()
      .from(entries)
      .where(inArray(entries.kind, [...AUDITED_KINDS]))
      .orderBy(desc(entries.recordedAt)),
  );
  const items = await describeRecords(db, rows, { keys });
  return items.filter((i) => i.verdict === null);
}

export async function auditRecord(
  db: Db,
  { id, keys }: { id: string; keys: CheckpointKeys },
): Promise<AuditItem | null> {
  const [row] = await db
    .select()
    .from(entries)
    .where(and(eq(entries.id, id), inArray(entries.kind, [...AUDITED_KINDS])));
  if (!row) return null;
  const [item] = await describeRecords(db, [row], { keys });
  return item ?? null;
}

export type TransferFilter = {
  cryostatId?: string;
  personId?: string;
  from?: string;
  to?: string;
  flag?: FlagCode;
  kinds?: (typeof AUDITED_KINDS)[number][];
  sort?: "date" | "cryostat" | "efficiency" | "flags";
  dir?: "asc" | "desc";
};

/** All records of the given kinds (transfers by default) matching the filters, with their flags. */
export async function auditTable(db: Db, f: TransferFilter & { keys: CheckpointKeys }): Promise<AuditItem[]> {
  const kinds = f.kinds?.length ? f.kinds : ["transfer"];
  const rows = latestOnly(
    await db
      .select()
      .from(entries)
      .where(
        and(
          inArray(entries.kind, kinds),
          f.cryostatId ? eq(entries.cryostatId, f.cryostatId) : undefined,
          f.from ? gte(entries.recordedAt, new Date(f.from)) : undefined,
          f.to ? lte(entries.recordedAt, new Date(f.to)) : undefined,
        ),
      )
      .orderBy(asc(entries.recordedAt)),
  );
  let items = await describeRecords(db, rows, { keys: f.keys });
  if (f.personId) {
    const pid = f.personId;
    items = items.filter(
      (i) => i.entry.authorId === pid || (payloadOf(i.entry, "transfer")?.peoplePresent ?? []).includes(pid),
    );
  }
  if (f.flag) items = items.filter((i) => i.flags.some((x) => x.code === f.flag));
  const dir = f.dir === "asc" ? 1 : -1;
  const eff = (i: AuditItem) =>
    i.figures && "efficiencyPercent" in i.figures ? (i.figures.efficiencyPercent ?? -1) : -1;
  const key: Record<NonNullable<TransferFilter["sort"]>, (a: AuditItem, b: AuditItem) => number> = {
    date: (a, b) => a.entry.recordedAt.localeCompare(b.entry.recordedAt),
    cryostat: (a, b) =>
      a.cryostatName.localeCompare(b.cryostatName) || a.entry.recordedAt.localeCompare(b.entry.recordedAt),
    efficiency: (a, b) => eff(a) - eff(b),
    flags: (a, b) => a.flags.length - b.flags.length || a.entry.recordedAt.localeCompare(b.entry.recordedAt),
  };
  return items.sort((a, b) => dir * key[f.sort ?? "date"](a, b));
}
