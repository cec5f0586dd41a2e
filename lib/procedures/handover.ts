// The cryostat summary a shift handover carries, derived from the log the tablet holds: state,
// latest stage temperatures, helium level (litres via the reservoir calibration) and the days
// left to the minimum level from the boil-off since the last fill, field and persistent mode,
// open runs. Pure: no network, so the outgoing person can hand over offline.
import { boilOffRate, forecastMinimumLevel, litresFromLevel } from "@/lib/cryo/helium";
import type { CryostatConfig } from "@/lib/schemas/cryostat";
import { type EntryFields, type EntryKind, isKind } from "@/lib/schemas/entry";

type E = EntryFields<"id" | "recordedAt" | "runId" | "supersedes">;

export type HandoverSummary = {
  state?: "warm" | "cooling" | "cold" | "warming" | "maintenance";
  stages: { stage: string; valueK: number; at: string }[];
  heliumPercent?: number;
  heliumLitres?: number;
  forecastDays?: number;
  fieldT?: number;
  persistent?: boolean;
  openRuns: string[];
  openIssues: string[];
};

const DAY = 86_400_000;

export function handoverSummary(entries: E[], config: CryostatConfig, now = Date.now()): HandoverSummary {
  const replaced = new Set(entries.flatMap((e) => (e.supersedes ? [e.supersedes] : [])));
  const list = entries.filter((e) => !replaced.has(e.id)).sort((a, b) => a.recordedAt.localeCompare(b.recordedAt));
  const last = <K extends EntryKind>(kind: K) => list.filter((e) => isKind(e, kind)).at(-1);
  const out: HandoverSummary = { stages: [], openRuns: [], openIssues: [] };

  const st = last("state")?.payload;
  if (st?.state) out.state = st.state;

  for (const s of config.stages) {
    const r = list.filter((e) => isKind(e, "reading")).findLast((e) => e.payload.stage === s.key);
    if (!r) continue;
    const p = r.payload;
    const valueK = p.unit === "mK" ? p.value / 1000 : p.unit === "K" ? p.value : NaN;
    if (Number.isFinite(valueK)) out.stages.push({ stage: s.label, valueK, at: r.recordedAt });
  }

  // Level history: helium.level readings and the level after each transfer; boil-off since the last fill.
  const levels = list.flatMap((e) => {
    if (e.kind === "helium.level") return [{ t: Date.parse(e.recordedAt), percent: e.payload.percent, fill: false }];
    if (e.kind === "transfer")
      return [{ t: Date.parse(e.recordedAt), percent: e.payload.levelAfterPercent, fill: true }];
    return [];
  });
  const lastLevel = levels.at(-1);
  if (lastLevel && config.reservoir) {
    out.heliumPercent = lastLevel.percent;
    try {
      out.heliumLitres = litresFromLevel(lastLevel.percent, config.reservoir.calibration);
      const fillIdx = levels.map((l) => l.fill).lastIndexOf(true);
      const since = levels.slice(Math.max(0, fillIdx)).filter((l) => l.t > now - 30 * DAY);
      const rate = boilOffRate(
        since.map((l) => ({ timeMs: l.t, litres: litresFromLevel(l.percent, config.reservoir!.calibration) })),
      );
      const f = forecastMinimumLevel(
        rate,
        litresFromLevel(config.reservoir.minimumPercent, config.reservoir.calibration),
        now,
      );
      if (f.forecast) out.forecastDays = Math.round(f.daysLeft * 10) / 10;
    } catch {
      /* too few readings or a rise: no forecast rather than a wrong one */
    }
  }

  const field = last("field.setting")?.payload;
  if (field) {
    out.fieldT = field.fieldT;
    out.persistent = field.persistent;
  }

  const ended = new Set(list.filter((e) => e.kind === "run.abort" || e.kind === "run.complete").map((e) => e.runId));
  out.openRuns = list
    .filter((e) => isKind(e, "run.start"))
    .filter((e) => !ended.has(e.id))
    .map((e) => e.payload.title);
  out.openIssues = list
    .filter((e) => isKind(e, "incident"))
    .filter((e) => Date.parse(e.recordedAt) > now - 14 * DAY)
    .map((e) => e.payload.title);
  return out;
}
