// Cryostats and the room overview: each cryostat with the latest facts derived from its log
// (state, stage temperatures, helium level, field, last entry, who holds the shift).
import { and, asc, desc, eq, inArray, sql } from "drizzle-orm";
import type { Db } from "@/db/client";
import { type Cryostat, cryostats, entries, users } from "@/db/schema";
import type { CryostatState } from "@/lib/schemas/cryostat";
import { type EntryKind, isKindOf, payloadOf } from "@/lib/schemas/entry";
import { toStoredRow } from "./stored";

export async function listCryostats(db: Db): Promise<Cryostat[]> {
  return db.select().from(cryostats).orderBy(asc(cryostats.name));
}

export async function getCryostat(db: Db, { id }: { id: string }): Promise<Cryostat | undefined> {
  const [c] = await db.select().from(cryostats).where(eq(cryostats.id, id));
  return c;
}

export type StageReading = { stage: string; value: number; unit: string; at: string };
export type CryostatOverview = Cryostat & {
  state: CryostatState | null;
  stages: StageReading[];
  helium: { percent: number; at: string } | null;
  field: { fieldT: number; currentA: number; persistent: boolean; at: string } | null;
  lastEntry: { kind: string; at: string; authorName: string } | null;
  onShift: { name: string; since: string } | null;
};

/** The latest entry per (cryostat, key) for the given kinds; `key` splits readings by stage. */
async function latestBy<K extends EntryKind>(db: Db, kinds: readonly K[], byStage: boolean) {
  const stageKey = sql`${entries.payload}->>'stage'`;
  const on = byStage ? [entries.cryostatId, stageKey] : [entries.cryostatId];
  const rows = await db
    .selectDistinctOn(on)
    .from(entries)
    .where(and(inArray(entries.kind, [...kinds]), byStage ? sql`${entries.payload} ? 'stage'` : undefined))
    .orderBy(...on, desc(entries.recordedAt));
  return rows.map(toStoredRow).filter((e) => isKindOf(e, kinds));
}

export async function roomOverview(db: Db): Promise<CryostatOverview[]> {
  const [list, states, stages, helium, fields, last, handovers, people] = await Promise.all([
    listCryostats(db),
    latestBy(db, ["state"], false),
    latestBy(db, ["reading"], true),
    latestBy(db, ["helium.level", "transfer"], false),
    latestBy(db, ["field.setting"], false),
    latestBy(
      db,
      ["note", "reading", "helium.level", "field.setting", "state", "handover", "transfer", "quench", "incident"],
      false,
    ),
    latestBy(db, ["handover"], false),
    db.select({ id: users.id, name: users.name }).from(users),
  ]);
  const nameOf = new Map(people.map((p) => [p.id, p.name]));
  const of = <T extends { cryostatId: string | null }>(rows: T[], id: string) =>
    rows.filter((r) => r.cryostatId === id);
  return list.map((c) => {
    const s = of(states, c.id)[0];
    const h = of(helium, c.id)[0];
    const f = of(fields, c.id)[0];
    const l = of(last, c.id)[0];
    const ho = of(handovers, c.id)[0];
    const order = c.config.stages.map((st) => st.key);
    return {
      ...c,
      state: s?.payload.state ?? null,
      stages: of(stages, c.id)
        .map((r) => ({ stage: r.payload.stage ?? "", value: r.payload.value, unit: r.payload.unit, at: r.recordedAt }))
        .sort((a, b) => order.indexOf(a.stage) - order.indexOf(b.stage)),
      helium: h
        ? {
            percent: payloadOf(h, "helium.level")?.percent ?? payloadOf(h, "transfer")?.levelAfterPercent ?? 0,
            at: h.recordedAt,
          }
        : null,
      field: f
        ? { fieldT: f.payload.fieldT, currentA: f.payload.currentA, persistent: f.payload.persistent, at: f.recordedAt }
        : null,
      lastEntry: l ? { kind: l.kind, at: l.recordedAt, authorName: nameOf.get(l.authorId) ?? l.authorId } : null,
      onShift: ho ? { name: nameOf.get(ho.payload.toUserId ?? ho.authorId) ?? "", since: ho.recordedAt } : null,
    };
  });
}
