// Cryostats and the room overview: each cryostat with the latest facts derived from its log
// (state, stage temperatures, helium level, field, last entry, who holds the shift).
import { and, asc, desc, eq, inArray, sql } from "drizzle-orm";
import type { Db } from "@/db/client";
import { type Cryostat, cryostats, entries, users } from "@/db/schema";
import type { CryostatState } from "@/lib/schemas/cryostat";

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

type Latest = {
  cryostatId: string | null;
  kind: string;
  payload: Record<string, unknown>;
  recordedAt: Date;
  authorId: string;
};

/** The latest entry per (cryostat, key) for the given kinds; `key` splits readings by stage. */
async function latestBy(db: Db, kinds: string[], byStage: boolean): Promise<Latest[]> {
  const stageKey = sql`${entries.payload}->>'stage'`;
  const on = byStage ? [entries.cryostatId, stageKey] : [entries.cryostatId];
  return db
    .selectDistinctOn(on, {
      cryostatId: entries.cryostatId,
      kind: entries.kind,
      payload: entries.payload,
      recordedAt: entries.recordedAt,
      authorId: entries.authorId,
    })
    .from(entries)
    .where(and(inArray(entries.kind, kinds), byStage ? sql`${entries.payload} ? 'stage'` : undefined))
    .orderBy(...on, desc(entries.recordedAt));
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
  const of = (rows: Latest[], id: string) => rows.filter((r) => r.cryostatId === id);
  return list.map((c) => {
    const s = of(states, c.id)[0];
    const h = of(helium, c.id)[0];
    const f = of(fields, c.id)[0];
    const l = of(last, c.id)[0];
    const ho = of(handovers, c.id)[0];
    const hp = h?.payload as { percent?: number; levelAfterPercent?: number } | undefined;
    const fp = f?.payload as { fieldT: number; currentA: number; persistent: boolean } | undefined;
    const order = c.config.stages.map((st) => st.key);
    return {
      ...c,
      state: (s?.payload as { state?: CryostatState } | undefined)?.state ?? null,
      stages: of(stages, c.id)
        .map((r) => {
          const p = r.payload as { stage: string; value: number; unit: string };
          return { stage: p.stage, value: p.value, unit: p.unit, at: r.recordedAt.toISOString() };
        })
        .sort((a, b) => order.indexOf(a.stage) - order.indexOf(b.stage)),
      helium: h && hp ? { percent: hp.percent ?? hp.levelAfterPercent ?? 0, at: h.recordedAt.toISOString() } : null,
      field:
        f && fp
          ? { fieldT: fp.fieldT, currentA: fp.currentA, persistent: fp.persistent, at: f.recordedAt.toISOString() }
          : null,
      lastEntry: l
        ? { kind: l.kind, at: l.recordedAt.toISOString(), authorName: nameOf.get(l.authorId) ?? l.authorId }
        : null,
      onShift: ho
        ? {
            name: nameOf.get((ho.payload as { toUserId?: string }).toUserId ?? ho.authorId) ?? "",
            since: ho.recordedAt.toISOString(),
          }
        : null,
    };
  });
}
