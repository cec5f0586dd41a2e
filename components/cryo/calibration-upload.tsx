"use client";
// Sensor calibration upload: pick the thermometer channel (cryostat + stage), choose the file,
// see it parsed and plotted before accepting it (admin or technician), then the tables in force.
// Parsing for the preview runs in the browser with the same lib/cryo parser the server re-runs.
// Accepting needs the network; the tables in force are read from the tablet store, where the
// sync's pull brings them (and brings an accepted table back at once).
import { useCallback, useMemo, useState } from "react";
import type uPlotType from "uplot";
import { type Palette, UplotChart } from "@/components/charts/uplot-chart";
import { useMe } from "@/components/shell/use-me";
import { syncSoon } from "@/components/sync/runtime";
import { Button } from "@/components/ui/button";
import { OptionList } from "@/components/ui/form";
import { Notice, Panel } from "@/components/ui/panel";
import { api, problemText } from "@/components/ui/use-json";
import { type CalibrationTable, convertReading, parseCalibration, type SensorKind } from "@/lib/cryo";
import { useCalibrations, useCryostats } from "@/lib/local/hooks";
import { putAttachment } from "@/lib/local/record";
import {
  type CalibrationRecord,
  type CalibrationUpload,
  COLUMN_ORDER_OPTIONS,
  MAX_CALIBRATION_BYTES,
  SENSOR_KIND_LABEL,
  SENSOR_KIND_VALUES,
} from "@/lib/schemas/calibration";
import { figure, readNumber, temperatureText } from "./derive";

const SELECT = "min-h-12 w-full rounded-xl border-2 border-line bg-bg px-3 py-2 text-lg text-ink focus:border-accent";

function PreviewChart({ table }: { table: CalibrationTable }) {
  const data = useMemo<uPlotType.AlignedData>(
    () => [table.points.map((p) => p.value), table.points.map((p) => p.temperatureK)],
    [table],
  );
  const resistive = table.quantity === "resistance";
  const options = useCallback(
    (p: Palette): Omit<uPlotType.Options, "width"> => ({
      height: 240,
      legend: { show: false },
      scales: { x: { time: false, ...(resistive ? { distr: 3, log: 10 } : {}) }, y: { distr: 3, log: 10 } },
      axes: [
        {
          stroke: p.axis,
          grid: { stroke: p.grid },
          font: p.font,
          labelFont: p.font,
          label: resistive ? "Resistance (Ω)" : "Voltage (V)",
        },
        {
          stroke: p.axis,
          grid: { stroke: p.grid },
          font: p.font,
          labelFont: p.font,
          label: "Temperature",
          size: 64,
          values: (_u, splits) => splits.map((k) => (k == null ? "" : temperatureText(k))),
        },
      ],
      series: [{}, { label: "Calibration", stroke: p.series[0], width: 2, points: { size: 5 } }],
    }),
    [resistive],
  );
  return (
    <UplotChart label="The calibration curve: temperature against the sensor's reading" options={options} data={data} />
  );
}

export function CalibrationUploadPage() {
  const { me } = useMe();
  const mayAccept = me?.role === "facility_admin" || me?.role === "technician";
  const list = useCryostats() ?? [];
  const [cryostatId, setCryostatId] = useState("");
  const cryostat = list.find((c) => c.id === cryostatId) ?? list[0];
  const [stage, setStage] = useState("");
  const stageKey = cryostat?.config.stages.some((s) => s.key === stage)
    ? stage
    : (cryostat?.config.stages.at(-1)?.key ?? "");
  const [sensorKind, setSensorKind] = useState<SensorKind>("ruthenium-oxide");
  const [columns, setColumns] = useState<"auto" | "temperature-value" | "value-temperature">("auto");
  const [sensorLabel, setSensorLabel] = useState("");
  const [file, setFile] = useState<{ name: string; text: string } | null>(null);
  const [fileError, setFileError] = useState<string | null>(null);
  const [trial, setTrial] = useState("");
  const [busy, setBusy] = useState(false);
  const [result, setResult] = useState<{ tone: "ok" | "danger"; text: string } | null>(null);
  const inForce = useCalibrations(cryostat?.id);

  const preview = useMemo((): { table: CalibrationTable } | { error: string } | null => {
    if (!file) return null;
    try {
      return { table: parseCalibration(file.text, { sensorKind, ...(columns === "auto" ? {} : { columns }) }) };
    } catch (e) {
      return { error: e instanceof Error ? e.message : String(e) };
    }
  }, [file, sensorKind, columns]);

  const trialResult = useMemo(() => {
    if (!preview || !("table" in preview)) return null;
    const v = readNumber(trial);
    if (v === undefined) return null;
    try {
      return { ok: temperatureText(convertReading(preview.table, v)) };
    } catch (e) {
      return { error: (e as Error).message };
    }
  }, [preview, trial]);

  const onFile = async (f: File | undefined) => {
    setResult(null);
    setFileError(null);
    setFile(null);
    if (!f) return;
    if (f.size > MAX_CALIBRATION_BYTES) {
      setFileError(
        `The file is ${Math.round(f.size / 1000)} kB; a calibration table is a small text file (up to 200 kB).`,
      );
      return;
    }
    const text = await f.text();
    if (text.includes("\u0000")) {
      setFileError("This is not a text file. Export the table as text or CSV (two columns).");
      return;
    }
    setFile({ name: f.name, text });
  };

  const accept = async () => {
    if (!cryostat || !file || !preview || !("table" in preview)) return;
    setBusy(true);
    setResult(null);
    // The file itself goes through the tablet's attachment store (uploaded on the next sync);
    // the table row keeps its id. If the store refuses (no local session), the row still keeps
    // the file's text.
    let attachmentId: string | undefined;
    try {
      attachmentId = await putAttachment(new Blob([file.text], { type: "text/plain" }), {
        fileName: file.name,
        mime: "text/plain",
      });
    } catch {
      attachmentId = undefined;
    }
    const body: CalibrationUpload = {
      cryostatId: cryostat.id,
      stage: stageKey,
      sensorKind,
      sensorLabel: sensorLabel.trim(),
      fileName: file.name,
      text: file.text,
      ...(columns === "auto" ? {} : { columns }),
      ...(attachmentId ? { attachmentId } : {}),
    };
    try {
      await api<{ calibration: CalibrationRecord }>("/api/calibrations", { json: body });
      syncSoon(); // the new table reaches this tablet's store (and its reading forms) with the pull
      const stageLabel = cryostat.config.stages.find((s) => s.key === stageKey)?.label ?? stageKey;
      setResult({
        tone: "ok",
        text: `Accepted: ${cryostat.name}, ${stageLabel} now converts readings with ${sensorLabel.trim()}.`,
      });
    } catch (e) {
      setResult({
        tone: "danger",
        text: problemText(e, "No connection to the server: the table was not accepted. Try again when online.", true),
      });
    } finally {
      setBusy(false);
    }
  };

  const stageName = (id: string, key: string) =>
    list.find((c) => c.id === id)?.config.stages.find((s) => s.key === key)?.label ?? key;

  return (
    <div className="flex flex-col gap-4">
      <div>
        <h1 className="text-3xl font-bold">Sensor calibrations</h1>
        <p className="text-muted">
          One table per thermometer channel. Check the preview before accepting: the reading form of that stage converts
          resistance (or diode voltage) to temperature with it.
        </p>
      </div>
      {!mayAccept && me && (
        <Notice tone="neutral" title="View only">
          A facility admin or a technician accepts calibration tables. You can preview a file here.
        </Notice>
      )}
      <Panel className="flex flex-col gap-3">
        <h2 className="text-xl font-bold">1. Channel and file</h2>
        <div className="grid gap-3 sm:grid-cols-2">
          <label className="flex flex-col gap-1 font-semibold">
            Cryostat
            <select className={SELECT} value={cryostat?.id ?? ""} onChange={(e) => setCryostatId(e.target.value)}>
              <OptionList options={list.map((c) => ({ value: c.id, label: c.name }))} />
            </select>
          </label>
          <label className="flex flex-col gap-1 font-semibold">
            Stage
            <select className={SELECT} value={stageKey} onChange={(e) => setStage(e.target.value)}>
              <OptionList options={(cryostat?.config.stages ?? []).map((s) => ({ value: s.key, label: s.label }))} />
            </select>
          </label>
          <label className="flex flex-col gap-1 font-semibold">
            Sensor kind
            <select className={SELECT} value={sensorKind} onChange={(e) => setSensorKind(e.target.value as SensorKind)}>
              <OptionList options={SENSOR_KIND_VALUES.map((k) => ({ value: k, label: SENSOR_KIND_LABEL[k] }))} />
            </select>
          </label>
          <label className="flex flex-col gap-1 font-semibold">
            Sensor name or serial
            <input
              className={SELECT}
              value={sensorLabel}
              onChange={(e) => setSensorLabel(e.target.value)}
              placeholder="e.g. RX-102 #A4411"
            />
          </label>
          <label className="flex flex-col gap-1 font-semibold">
            Column order
            <select className={SELECT} value={columns} onChange={(e) => setColumns(e.target.value as typeof columns)}>
              <OptionList options={COLUMN_ORDER_OPTIONS} />
            </select>
          </label>
          <label className="flex flex-col gap-1 font-semibold">
            Calibration file (text or CSV, two columns)
            <input
              type="file"
              accept=".txt,.csv,.dat,.tsv,text/plain,text/csv"
              className="min-h-12 rounded-xl border-2 border-dashed border-line bg-bg px-3 py-2 text-base text-ink file:mr-3 file:rounded-lg file:border-0 file:bg-sunk file:px-3 file:py-2 file:font-semibold file:text-ink"
              onChange={(e) => void onFile(e.target.files?.[0])}
            />
          </label>
        </div>
        {fileError && (
          <p role="alert" className="font-semibold text-danger">
            {fileError}
          </p>
        )}
      </Panel>

      {preview && (
        <Panel className="flex flex-col gap-3" aria-label="Preview">
          <h2 className="text-xl font-bold">2. Preview — {file?.name}</h2>
          {"error" in preview ? (
            <Notice tone="danger" title="This file cannot be used" role="alert">
              {preview.error}
            </Notice>
          ) : (
            <>
              <dl className="grid gap-x-6 gap-y-1 rounded-xl bg-sunk px-4 py-3 sm:grid-cols-3">
                <div>
                  <dt className="text-base font-semibold text-muted">Points</dt>
                  <dd className="num text-lg font-semibold">{preview.table.points.length}</dd>
                </div>
                <div>
                  <dt className="text-base font-semibold text-muted">Temperature range</dt>
                  <dd className="num text-lg font-semibold">
                    {temperatureText(preview.table.range.temperatureMinK)} –{" "}
                    {temperatureText(preview.table.range.temperatureMaxK)}
                  </dd>
                </div>
                <div>
                  <dt className="text-base font-semibold text-muted">Reading range</dt>
                  <dd className="num text-lg font-semibold">
                    {figure(preview.table.range.valueMin)} – {figure(preview.table.range.valueMax)}{" "}
                    {preview.table.valueUnit}
                  </dd>
                </div>
              </dl>
              <PreviewChart table={preview.table} />
              <div className="grid gap-3 sm:grid-cols-2">
                <label className="flex flex-col gap-1 font-semibold">
                  Try a reading ({preview.table.valueUnit})
                  <input
                    className={`${SELECT} num`}
                    inputMode="decimal"
                    value={trial}
                    onChange={(e) => setTrial(e.target.value)}
                  />
                </label>
                <div className="flex items-end" role="status" aria-live="polite">
                  {trialResult && "ok" in trialResult && <p className="num text-xl font-semibold">{trialResult.ok}</p>}
                  {trialResult && "error" in trialResult && (
                    <p className="text-base font-semibold text-danger">{trialResult.error}</p>
                  )}
                </div>
              </div>
              {mayAccept && (
                <div className="flex flex-wrap items-center gap-3">
                  <Button variant="primary" disabled={busy || sensorLabel.trim() === ""} onClick={() => void accept()}>
                    {busy
                      ? "Accepting…"
                      : `Accept for ${cryostat?.name ?? ""}, ${stageName(cryostat?.id ?? "", stageKey)}`}
                  </Button>
                  {sensorLabel.trim() === "" && (
                    <p className="text-base text-muted">Give the sensor&apos;s name or serial first.</p>
                  )}
                </div>
              )}
            </>
          )}
        </Panel>
      )}
      {result && (
        <Notice tone={result.tone} role={result.tone === "danger" ? "alert" : "status"}>
          {result.text}
        </Notice>
      )}

      <Panel className="flex flex-col gap-2">
        <h2 className="text-xl font-bold">Tables in force{cryostat ? ` — ${cryostat.name}` : ""}</h2>
        {inForce && inForce.length === 0 && <p className="text-muted">None yet.</p>}
        <ul className="flex flex-col divide-y divide-line">
          {(inForce ?? []).map((c) => (
            <li key={c.id} className="flex flex-wrap justify-between gap-2 py-2">
              <span>
                <span className="font-semibold">{stageName(c.cryostatId, c.stage)}</span> — {c.sensorLabel} (
                {SENSOR_KIND_LABEL[c.sensorKind]})
              </span>
              <span className="text-base text-muted">
                <span className="num">{c.table.points.length}</span> points,{" "}
                {temperatureText(c.table.range.temperatureMinK)}–{temperatureText(c.table.range.temperatureMaxK)} ·{" "}
                {c.fileName} ·{" "}
                {new Date(c.acceptedAt).toLocaleDateString("en-GB", {
                  day: "2-digit",
                  month: "short",
                  year: "numeric",
                })}
              </span>
            </li>
          ))}
        </ul>
      </Panel>
    </div>
  );
}
