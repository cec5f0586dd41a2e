// Pure shaping of a cryostat's series for uPlot: aligned columns (time in seconds, null where a
// series has no point), the boil-off fit since the last fill and its forecast to the minimum level.

import { sinceLastFill } from "@/components/cryo/derive";
import {
  type BoilOffRate,
  boilOffRate,
  forecastMinimumLevel,
  litresFromLevel,
  type MinimumLevelForecast,
} from "@/lib/cryo";
import type { CryostatConfig } from "@/lib/schemas/cryostat";
import type { CryostatSeries } from "@/lib/series";

export type Column = (number | null)[];

/** Merge point lists onto one sorted time axis (seconds); each list becomes one column. */
export function align(lists: readonly (readonly { t: number; y: number }[])[]): [number[], ...Column[]] {
  const times = [...new Set(lists.flatMap((l) => l.map((p) => p.t)))].sort((a, b) => a - b);
  const index = new Map(times.map((t, i) => [t, i]));
  const columns = lists.map((l) => {
    const col: Column = new Array(times.length).fill(null);
    for (const p of l) col[index.get(p.t) ?? 0] = p.y;
    return col;
  });
  return [times.map((t) => t / 1000), ...columns];
}

export interface HeliumModel {
  unit: "L" | "%";
  levels: { t: number; y: number }[];
  fit: { t: number; y: number }[];
  minimum: { t: number; y: number }[];
  minimumValue: number | null;
  rate: BoilOffRate | null;
  forecast: MinimumLevelForecast | null;
  /** Why there is no fit (too few readings since the fill, rising level…). */
  fitNote: string | null;
}

/** Levels (in litres when the reservoir is calibrated), the boil-off fit and the forecast. */
export function heliumModel(series: CryostatSeries, config: CryostatConfig, nowMs: number): HeliumModel | null {
  const h = series.helium;
  if (!h || h.levels.length === 0) return null;
  const cal = config.reservoir?.calibration;
  const inLitres = cal !== undefined && h.levels.every((l) => l.litres !== null);
  const y = (percent: number, litres: number | null) => (inLitres ? (litres ?? NaN) : percent);
  const levels = h.levels.map((l) => ({ t: l.t, y: y(l.percent, l.litres) }));
  const minPercent = h.minimumPercent;
  let minimumValue: number | null = null;
  if (minPercent !== null) {
    try {
      minimumValue = inLitres && cal ? litresFromLevel(minPercent, cal) : minPercent;
    } catch {
      minimumValue = null;
    }
  }
  const model: HeliumModel = {
    unit: inLitres ? "L" : "%",
    levels,
    fit: [],
    minimum: [],
    minimumValue,
    rate: null,
    forecast: null,
    fitNote: null,
  };
  const recent = sinceLastFill(h.levels.map((l) => ({ timeMs: l.t, percent: l.percent })));
  const byTime = new Map(h.levels.map((l) => [l.t, l]));
  try {
    // The fit is in litres when calibrated (percent otherwise): "litres" below means "the y unit".
    const rate = boilOffRate(
      recent.map((p) => ({ timeMs: p.timeMs, litres: y(p.percent, byTime.get(p.timeMs)?.litres ?? null) })),
    );
    model.rate = rate;
    const first = recent[0]?.timeMs ?? nowMs;
    const at = (t: number) => rate.centroidLitres - (rate.litresPerDay * (t - rate.centroidTimeMs)) / 86_400_000;
    let end = nowMs;
    if (minimumValue !== null) {
      const f = forecastMinimumLevel(rate, minimumValue, nowMs);
      model.forecast = f;
      if (f.forecast) end = Math.max(nowMs, Math.min(f.reachMs, nowMs + 60 * 86_400_000));
    }
    model.fit = [
      { t: first, y: at(first) },
      { t: end, y: at(end) },
    ];
  } catch (e) {
    model.fitNote = e instanceof Error ? e.message : String(e);
  }
  if (minimumValue !== null) {
    const t0 = levels[0]?.t ?? nowMs;
    const t1 = Math.max(levels.at(-1)?.t ?? nowMs, model.fit.at(-1)?.t ?? nowMs);
    model.minimum = [
      { t: t0, y: minimumValue },
      { t: t1, y: minimumValue },
    ];
  }
  return model;
}

/** Field settings as steps held until now. */
export function fieldSteps(series: CryostatSeries, nowMs: number): { t: number; y: number }[] {
  const pts = series.fields.map((f) => ({ t: f.t, y: f.fieldT }));
  const last = pts.at(-1);
  if (last && last.t < nowMs) pts.push({ t: nowMs, y: last.y });
  return pts;
}
