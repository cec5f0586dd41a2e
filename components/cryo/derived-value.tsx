"use client";
// <DerivedValue/>: the figure a reading implies, shown live beside its input (a pot or VTI
// pressure → its ITS-90 temperature; a helium level → litres and days left; a magnet current →
// field and ramp time; a sensor resistance → temperature from the stage's calibration table).
// Pure client-side: the level history, the current field and the calibration tables come from
// props when the caller has them, else from the tablet store (the cryostat's log and the tables
// in force as the last sync brought them), so they work offline.
import { useMemo } from "react";
import type { CalibrationTable } from "@/lib/cryo";
import { useCalibrations, useCryostatSeries } from "@/lib/local/hooks";
import { type CryostatLike, deriveReading, type LevelPoint, sinceLastFill } from "./derive";
import { EstimateNote } from "./estimate-note";

/** The log entries the level history and the current field are built from (not every reading). */
const DERIVE_KINDS = ["helium.level", "transfer", "quench", "field.setting"] as const;

export interface DerivedValueProps {
  /** The cryostat row (id + config) the reading belongs to. */
  cryostat: CryostatLike;
  /** The reading's quantity text ("Helium level", "VTI pressure", "Magnet current", "Resistance"…). */
  quantity: string;
  /** The unit chosen in the form (one of lib/schemas/units UNITS). */
  unit: string;
  /** The input's current value: the raw text is fine; empty or half-typed shows nothing. */
  value: number | string | null | undefined;
  /** Stage key, for vapour-pressure stages and calibrated sensors. */
  stage?: string;
  /** Level readings since the last transfer; default: from the cryostat's log on the tablet. */
  levelHistory?: readonly LevelPoint[];
  /** The field now (T), start of the ramp estimate; default: the last field setting, else 0 T. */
  fromFieldT?: number;
  /** The stage's calibration table; default: the table in force for (cryostat, stage) on the tablet. */
  calibration?: CalibrationTable | null;
  /** Hide the magnet caution (when the caller shows its own beside the form). */
  hideCaution?: boolean;
  /** id for aria-describedby on the input. */
  id?: string;
  className?: string;
}

export function DerivedValue(props: DerivedValueProps) {
  const { cryostat, quantity, unit, value, stage, id, className = "" } = props;
  const needsSeries = props.levelHistory === undefined || props.fromFieldT === undefined;
  const series = useCryostatSeries(needsSeries ? cryostat.id : undefined, DERIVE_KINDS);
  const needsCalibration = props.calibration === undefined && stage !== undefined && /Ω|V$/.test(unit);
  const calibrations = useCalibrations(needsCalibration ? cryostat.id : undefined);

  const levelHistory = useMemo(() => {
    if (props.levelHistory) return props.levelHistory;
    const levels = series?.helium?.levels;
    return levels ? sinceLastFill(levels.map((l) => ({ timeMs: l.t, percent: l.percent }))) : undefined;
  }, [props.levelHistory, series]);
  const fromFieldT = props.fromFieldT ?? series?.fields.at(-1)?.fieldT;
  const calibration =
    props.calibration ??
    calibrations?.find((c) => c.cryostatId === cryostat.id && c.stage === stage)?.table ??
    undefined;

  const derived = deriveReading({
    cryostat,
    quantity,
    unit,
    value,
    ...(stage !== undefined ? { stage } : {}),
    ...(levelHistory ? { levelHistory } : {}),
    ...(fromFieldT !== undefined ? { fromFieldT } : {}),
    ...(calibration ? { calibration } : {}),
  });

  if (derived.status === "none") return <div id={id} role="status" aria-live="polite" className="sr-only" />;
  if (derived.status === "error") {
    return (
      <div
        id={id}
        role="status"
        aria-live="polite"
        data-derived="error"
        className={`block text-base font-semibold text-danger ${className}`}
      >
        {derived.message}
      </div>
    );
  }
  return (
    <div
      id={id}
      role="status"
      aria-live="polite"
      data-derived="ok"
      className={`block rounded-xl border border-line bg-sunk px-3 py-2 ${className}`}
    >
      <dl className="flex flex-wrap gap-x-6 gap-y-1">
        {derived.items.map((item) => (
          <div key={item.label} className="flex flex-col">
            <dt className="text-base font-semibold text-muted">{item.label}</dt>
            <dd className="num text-lg font-semibold text-ink">{item.text}</dd>
          </div>
        ))}
      </dl>
      {derived.note && <p className="mt-1 text-base text-muted">{derived.note}</p>}
      {derived.caution === "magnet" && !props.hideCaution && (
        <div className="mt-2">
          <EstimateNote topic="magnet" />
        </div>
      )}
    </div>
  );
}
