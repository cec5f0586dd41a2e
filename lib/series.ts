// Chart series of one cryostat, derived from its log: stage temperatures (K), helium levels
// (with the level before/after each transfer and quench, so fills show as steps) and field
// settings. Corrections win: an entry superseded by a later one is left out. Pure, so the server
// (db/queries/series.ts) and the tablet build the same series.
import { litresFromLevel } from "@/lib/cryo";
import type { CryostatConfig } from "@/lib/schemas/cryostat";

export interface SeriesEntry {
  id: string;
  kind: string;
  payload: Record<string, unknown>;
  recordedAt: Date | string;
  supersedes: string | null;
}

export interface CryostatSeries {
  cryostatId: string;
  stages: { key: string; label: string; points: { t: number; k: number }[] }[];
  helium: {
    levels: { t: number; percent: number; litres: number | null }[];
    transfers: { t: number; beforePercent: number; afterPercent: number }[];
    capacityLitres: number | null;
    minimumPercent: number | null;
  } | null;
  fields: { t: number; fieldT: number; persistent: boolean }[];
  /** Each cooldown: from a "cooling" state to the next "cold" (null while still cooling). */
  cooldowns: { start: number; end: number | null }[];
  generatedAt: number;
}

export const SERIES_KINDS = ["reading", "helium.level", "transfer", "quench", "field.setting", "state"] as const;

const num = (x: unknown): number | undefined => (typeof x === "number" && Number.isFinite(x) ? x : undefined);

/** Kelvin from a reading's value and unit, or undefined when it is not a temperature. */
function kelvin(value: unknown, unit: unknown): number | undefined {
  const v = num(value);
  if (v === undefined || v <= 0) return undefined;
  if (unit === "K") return v;
  if (unit === "mK") return v / 1000;
  return undefined;
}

export function buildSeries(
  cryostat: { id: string; config: CryostatConfig },
  rows: readonly SeriesEntry[],
  now = Date.now(),
): CryostatSeries {
  const superseded = new Set(rows.map((r) => r.supersedes).filter((s): s is string => Boolean(s)));
  const live = rows
    .filter((r) => !superseded.has(r.id))
    .map((r) => ({ ...r, t: typeof r.recordedAt === "string" ? Date.parse(r.recordedAt) : r.recordedAt.getTime() }))
    .sort((a, b) => a.t - b.t);

  const { config } = cryostat;
  const stageMap = new Map(
    config.stages.map((s) => [s.key, { key: s.key, label: s.label, points: [] as { t: number; k: number }[] }]),
  );
  const reservoir = config.reservoir;
  const litres = (percent: number): number | null => {
    if (!reservoir) return null;
    try {
      return litresFromLevel(percent, reservoir.calibration);
    } catch {
      return null; // a level outside the calibration stays on the chart in %, without litres
    }
  };
  const levels: { t: number; percent: number; litres: number | null }[] = [];
  const transfers: { t: number; beforePercent: number; afterPercent: number }[] = [];
  const fields: { t: number; fieldT: number; persistent: boolean }[] = [];
  const cooldowns: { start: number; end: number | null }[] = [];

  for (const r of live) {
    const p = r.payload;
    if (r.kind === "reading") {
      const k = kelvin(p.value, p.unit);
      const stage = typeof p.stage === "string" ? stageMap.get(p.stage) : undefined;
      if (k !== undefined && stage) stage.points.push({ t: r.t, k });
    } else if (r.kind === "helium.level") {
      const percent = num(p.percent);
      if (percent !== undefined) levels.push({ t: r.t, percent, litres: litres(percent) });
    } else if (r.kind === "state") {
      const open = cooldowns.at(-1);
      if (p.state === "cooling" && !(open && open.end === null)) cooldowns.push({ start: r.t, end: null });
      else if (p.state === "cold" && open && open.end === null) open.end = r.t;
      else if (p.state !== "cooling" && open && open.end === null) open.end = r.t; // aborted: warming or maintenance
    } else if (r.kind === "transfer" || r.kind === "quench") {
      // A transfer's "before" is placed a second earlier so the fill draws as a step. A quench's
      // "before" is left out: the level logged that day may already be after it.
      const before = num(p.levelBeforePercent);
      const after = num(p.levelAfterPercent);
      if (before !== undefined && r.kind === "transfer")
        levels.push({ t: r.t - 1000, percent: before, litres: litres(before) });
      if (after !== undefined) levels.push({ t: r.t, percent: after, litres: litres(after) });
      if (r.kind === "transfer" && before !== undefined && after !== undefined)
        transfers.push({ t: r.t, beforePercent: before, afterPercent: after });
    } else if (r.kind === "field.setting") {
      const fieldT = num(p.fieldT);
      if (fieldT !== undefined) fields.push({ t: r.t, fieldT, persistent: p.persistent === true });
    }
  }
  levels.sort((a, b) => a.t - b.t);
  return {
    cryostatId: cryostat.id,
    stages: [...stageMap.values()],
    helium: reservoir
      ? { levels, transfers, capacityLitres: reservoir.capacityLitres, minimumPercent: reservoir.minimumPercent }
      : levels.length
        ? { levels, transfers, capacityLitres: null, minimumPercent: null }
        : null,
    fields,
    cooldowns,
    generatedAt: now,
  };
}
