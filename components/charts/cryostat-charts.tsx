"use client";
// The cryostat page's charts: stage temperatures on a log axis (cooldown and since), the helium
// level with the boil-off fit since the last fill and the forecast to the minimum level, and the
// magnet's field history. Data: the cryostat's series, built from its log in the tablet store.
import { useCallback, useEffect, useMemo, useState } from "react";
import type uPlotType from "uplot";
import { figure } from "@/components/cryo/derive";
import { Button } from "@/components/ui/button";
import { Notice, Panel } from "@/components/ui/panel";
import { useCryostat, useCryostatSeries } from "@/lib/local/hooks";
import type { CryostatConfig } from "@/lib/schemas/cryostat";
import type { CryostatSeries } from "@/lib/series";
import { align, fieldSteps, heliumModel } from "./chart-model";
import { type Palette, UplotChart } from "./uplot-chart";

const HEIGHT = 260;

/** Time ticks as the room reads them: "5 Nov", with the hour under it when the span is a few days. */
function timeTicks(u: uPlotType, splits: number[]): string[] {
  const span = (u.scales.x?.max ?? 0) - (u.scales.x?.min ?? 0);
  return splits.map((s) => {
    const d = new Date(s * 1000);
    const day = d.toLocaleDateString("en-GB", { day: "numeric", month: "short" });
    return span < 6 * 86_400 ? `${day}\n${d.toLocaleTimeString("en-GB", { hour: "2-digit", minute: "2-digit" })}` : day;
  });
}

function baseAxes(p: Palette, yLabel: string, yValues?: uPlotType.Axis["values"]): uPlotType.Axis[] {
  const common = {
    stroke: p.axis,
    grid: { stroke: p.grid, width: 1 },
    ticks: { stroke: p.grid, width: 1 },
    font: p.font,
    labelFont: p.font,
  };
  return [
    { ...common, values: timeTicks, space: 70, size: 56 },
    { ...common, label: yLabel, size: 64, ...(yValues ? { values: yValues } : {}) },
  ];
}

const LEGEND = { live: false };

/** Kelvin tick labels in the unit a fridge person reads. */
function kelvinTicks(_u: uPlotType, splits: number[]): string[] {
  return splits.map((k) => (k == null ? "" : k < 1 ? `${figure(k * 1000, 3)} mK` : `${figure(k, 3)} K`));
}

const HOUR_MS = 3_600_000;

function StageChart({ series }: { series: CryostatSeries }) {
  const last = (series.cooldowns ?? []).at(-1); // a copy remembered by an older build may lack it
  // Default view: the latest cooldown (plus half a day after "cold"), else the whole history.
  const [view, setView] = useState<"cooldown" | "all">(last ? "cooldown" : "all");
  const span = useMemo(
    () =>
      view === "cooldown" && last
        ? { from: last.start - 2 * HOUR_MS, to: (last.end ?? series.generatedAt) + 12 * HOUR_MS }
        : null,
    [view, last, series.generatedAt],
  );
  const withPoints = useMemo(
    () =>
      series.stages
        .map((s) => ({ ...s, points: span ? s.points.filter((p) => p.t >= span.from && p.t <= span.to) : s.points }))
        .filter((s) => s.points.length > 0),
    [series, span],
  );
  const data = useMemo(() => align(withPoints.map((s) => s.points.map((p) => ({ t: p.t, y: p.k })))), [withPoints]);
  const options = useCallback(
    (p: Palette): Omit<uPlotType.Options, "width"> => ({
      height: HEIGHT,
      legend: LEGEND,
      scales: { x: { time: true }, y: { distr: 3, log: 10 } },
      axes: baseAxes(p, "Temperature", kelvinTicks),
      series: [
        { label: "Time" },
        ...withPoints.map((s, i) => ({
          label: s.label,
          stroke: p.series[i % p.series.length],
          width: 2,
          spanGaps: true,
          points: { size: 4 },
          value: (_u: uPlotType, v: number | null) =>
            v == null ? "—" : v < 1 ? `${figure(v * 1000, 3)} mK` : `${figure(v, 3)} K`,
        })),
      ],
    }),
    [withPoints],
  );
  if (withPoints.length === 0) return <p className="text-muted">No stage temperatures logged yet.</p>;
  return (
    <>
      {last && (
        <div role="group" aria-label="Time span" className="mb-2 flex flex-wrap gap-2">
          <Button
            variant={view === "cooldown" ? "primary" : "secondary"}
            aria-pressed={view === "cooldown"}
            onClick={() => setView("cooldown")}
          >
            {last.end ? "Last cooldown" : "Cooldown so far"} (
            {new Date(last.start).toLocaleDateString("en-GB", { day: "numeric", month: "short" })}
            {last.end ? `, ${figure((last.end - last.start) / HOUR_MS, 3)} h` : ""})
          </Button>
          <Button
            variant={view === "all" ? "primary" : "secondary"}
            aria-pressed={view === "all"}
            onClick={() => setView("all")}
          >
            Whole history
          </Button>
        </div>
      )}
      <UplotChart label="Stage temperatures over time, logarithmic temperature axis" options={options} data={data} />
    </>
  );
}

function HeliumChart({ series, config, nowMs }: { series: CryostatSeries; config: CryostatConfig; nowMs: number }) {
  const model = useMemo(() => heliumModel(series, config, nowMs), [series, config, nowMs]);
  const data = useMemo(() => (model ? align([model.levels, model.fit, model.minimum]) : null), [model]);
  const options = useCallback(
    (p: Palette): Omit<uPlotType.Options, "width"> => ({
      height: HEIGHT,
      legend: LEGEND,
      scales: { x: { time: true }, y: { range: (_u, min, max) => [Math.min(0, min), Math.max(max * 1.05, 1)] } },
      axes: baseAxes(p, model?.unit === "L" ? "Liquid helium (L)" : "Level (%)"),
      series: [
        { label: "Time" },
        {
          label: model?.unit === "L" ? "Level (L)" : "Level (%)",
          stroke: p.series[0],
          width: 2,
          spanGaps: true,
          points: { size: 5 },
        },
        { label: "Boil-off fit", stroke: p.series[2], width: 2, dash: [8, 6], spanGaps: true, points: { show: false } },
        { label: "Minimum", stroke: p.danger, width: 1.5, dash: [3, 4], spanGaps: true, points: { show: false } },
      ],
    }),
    [model?.unit],
  );
  if (!model || !data) return <p className="text-muted">No helium levels logged yet.</p>;
  const f = model.forecast;
  return (
    <>
      <UplotChart
        label="Helium level with the boil-off fit since the last fill and the minimum level"
        options={options}
        data={data}
      />
      <p className="mt-2 text-base text-ink" data-testid="helium-forecast">
        {model.rate ? (
          <>
            Boil-off since the last fill: {figure(model.rate.litresPerDay, 3)} ±{" "}
            {figure(model.rate.standardErrorLitresPerDay, 2)} {model.unit}/day ({model.rate.points} readings).{" "}
            {f?.forecast
              ? `Minimum (${figure(model.minimumValue ?? NaN, 3)} ${model.unit}) reached about ${new Date(
                  f.reachMs,
                ).toLocaleString("en-GB", {
                  day: "2-digit",
                  month: "short",
                  hour: "2-digit",
                  minute: "2-digit",
                })}: ${figure(f.daysLeft, 2)} days left (${figure(f.daysLeftEarliest, 2)}–${f.daysLeftLatest === null ? "?" : figure(f.daysLeftLatest, 2)}).`
              : f && !f.forecast
                ? f.reason
                : ""}
          </>
        ) : (
          <>No boil-off fit: {model.fitNote}</>
        )}
      </p>
    </>
  );
}

function FieldChart({ series, nowMs }: { series: CryostatSeries; nowMs: number }) {
  const steps = useMemo(() => fieldSteps(series, nowMs), [series, nowMs]);
  const data = useMemo(() => align([steps]), [steps]);
  const options = useCallback(
    (p: Palette, lib: typeof uPlotType): Omit<uPlotType.Options, "width"> => ({
      height: 200,
      legend: LEGEND,
      scales: { x: { time: true }, y: { range: (_u, min, max) => [Math.min(0, min), Math.max(max * 1.1, 0.1)] } },
      axes: baseAxes(p, "Field (T)"),
      series: [
        { label: "Time" },
        {
          label: "Field (T)",
          stroke: p.series[3],
          width: 2,
          fill: p.fill,
          paths: lib.paths.stepped?.({ align: 1 }),
          points: { size: 6 },
        },
      ],
    }),
    [],
  );
  if (steps.length === 0) return <p className="text-muted">No field settings logged yet.</p>;
  return <UplotChart label="Magnet field settings over time" options={options} data={data} />;
}

/** The cryostat id from the address (/cryostats/<id>), for a page whose HTML carries no data. */
function idFromPath(): string | undefined {
  const m = /^\/cryostats\/([^/]+)/.exec(window.location.pathname);
  return m?.[1] ? decodeURIComponent(m[1]) : undefined;
}

/** Charts of one cryostat; without `cryostatId` it reads the id from the address. */
export function CryostatCharts({ cryostatId: given }: { cryostatId?: string }) {
  const [fromPath, setFromPath] = useState<string | undefined>(undefined);
  useEffect(() => {
    if (!given) setFromPath(idFromPath());
  }, [given]);
  const cryostatId = given ?? fromPath;
  if (!cryostatId) return null;
  return <ChartsFor cryostatId={cryostatId} />;
}

function ChartsFor({ cryostatId }: { cryostatId: string }) {
  // Built on the tablet from the cryostat's log as the store holds it (unsent entries included),
  // with the config (reservoir calibration, magnet) from the pulled cryostat: works offline.
  const cryostat = useCryostat(cryostatId);
  const series = useCryostatSeries(cryostatId);
  const config = cryostat?.config ?? null;
  const [nowMs, setNowMs] = useState<number | null>(null);
  // biome-ignore lint/correctness/useExhaustiveDependencies: "now" is taken again whenever the series changes
  useEffect(() => setNowMs(Date.now()), [series]);

  const data = series ?? null;
  return (
    <section aria-label="Charts" className="flex flex-col gap-4" data-testid="cryostat-charts">
      {series === null && (
        <Notice tone="warn" title="Charts unavailable" role="status">
          This cryostat is not on this tablet yet. The charts need one sync with the server.
        </Notice>
      )}
      {series === undefined && <p className="text-muted">Loading charts…</p>}
      {data && nowMs !== null && (
        <>
          {data.stages.some((s) => s.points.length > 0) && (
            <Panel>
              <h2 className="mb-2 text-xl font-bold">Stage temperatures</h2>
              <StageChart series={data} />
            </Panel>
          )}
          {data.helium && config && (
            <Panel>
              <h2 className="mb-2 text-xl font-bold">Helium level</h2>
              <HeliumChart series={data} config={config} nowMs={nowMs} />
            </Panel>
          )}
          {(data.fields.length > 0 || config?.magnet) && (
            <Panel>
              <h2 className="mb-2 text-xl font-bold">Magnet field</h2>
              <FieldChart series={data} nowMs={nowMs} />
            </Panel>
          )}
        </>
      )}
    </section>
  );
}
