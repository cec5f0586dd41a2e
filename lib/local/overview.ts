// The room at a glance, derived on the tablet from its entries (pulled + unsent), the same facts
// as the server's roomOverview: state, latest stage readings, helium level, field, last entry,
// who holds the shift. Superseded entries do not count; refused ones neither.
import type { CryostatState } from "@/lib/schemas/cryostat";
import { type EntryKind, isKind, isKindOf, payloadOf } from "@/lib/schemas/entry";
import type { StoredLocalEntry } from "./db";

export type LocalOverview = {
  state: CryostatState | null;
  stages: { stage: string; value: number; unit: string; at: string }[];
  helium: { percent: number; at: string } | null;
  field: { fieldT: number; currentA: number; persistent: boolean; at: string } | null;
  lastEntry: { kind: string; at: string; authorId: string; sync: StoredLocalEntry["sync"] } | null;
  onShift: { userId: string; since: string } | null;
  pending: number;
};

const LAST_KINDS = new Set<EntryKind>([
  "note",
  "reading",
  "helium.level",
  "field.setting",
  "state",
  "handover",
  "transfer",
  "quench",
  "incident",
]);

export function overviewOf(list: StoredLocalEntry[], stageOrder: string[]): LocalOverview {
  const superseded = new Set(list.flatMap((e) => (e.supersedes ? [e.supersedes] : [])));
  const live = list
    .filter((e) => e.sync !== "rejected" && !superseded.has(e.id))
    .sort((a, b) => b.recordedAt.localeCompare(a.recordedAt));
  const latest = <K extends EntryKind>(kinds: readonly K[]) => live.find((e) => isKindOf(e, kinds));
  const s = latest(["state"]);
  const h = latest(["helium.level", "transfer"]);
  const f = latest(["field.setting"]);
  const ho = latest(["handover"]);
  const l = live.find((e) => LAST_KINDS.has(e.kind));
  const stages = new Map<string, { stage: string; value: number; unit: string; at: string }>();
  for (const e of live) {
    if (!isKind(e, "reading")) continue;
    const p = e.payload;
    if (p.stage && !stages.has(p.stage))
      stages.set(p.stage, { stage: p.stage, value: p.value, unit: p.unit, at: e.recordedAt });
  }
  return {
    state: s?.payload.state ?? null,
    stages: [...stages.values()].sort((a, b) => stageOrder.indexOf(a.stage) - stageOrder.indexOf(b.stage)),
    helium: h
      ? {
          percent: payloadOf(h, "helium.level")?.percent ?? payloadOf(h, "transfer")?.levelAfterPercent ?? 0,
          at: h.recordedAt,
        }
      : null,
    field: f
      ? { fieldT: f.payload.fieldT, currentA: f.payload.currentA, persistent: f.payload.persistent, at: f.recordedAt }
      : null,
    lastEntry: l ? { kind: l.kind, at: l.recordedAt, authorId: l.authorId, sync: l.sync } : null,
    onShift: ho ? { userId: ho.payload.toUserId ?? ho.authorId, since: ho.recordedAt } : null,
    pending: list.filter((e) => e.sync === "pending").length,
  };
}
