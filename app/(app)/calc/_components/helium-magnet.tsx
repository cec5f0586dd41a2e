"use client";
// Helium bookkeeping and magnet calculators. Presets come from the cryostats remembered at the
// last online visit (reservoir calibration, magnet parameters); every figure can be overridden.
import { useState } from "react";
import { Calculator, type Inputs, parsePairs, type ResultRow, readsFields } from "@/components/cryo/calc-kit";
import { durationText, figure } from "@/components/cryo/derive";
import { EstimateNote } from "@/components/cryo/estimate-note";
import { Caution } from "@/components/safety/caution";
import { type Choice, OptionList } from "@/components/ui/form";
import {
  absolutePressurePa,
  type BathState,
  boilOffFromHeatLoad,
  boilOffRate,
  contourDistance,
  currentFromField,
  fieldFromCurrent,
  forecastMinimumLevel,
  GAS_REFERENCES,
  type GasReference,
  gasLitresFromLiquid,
  type LevelCalibration,
  litresFromLevel,
  litresFromMassAt,
  type MagnetSpec,
  type PressureReading,
  quenchBoilOffLitresMax,
  rampTime,
  SATURATION_RANGE,
  type SaturatedLiquid,
  storedEnergyJ,
  transferEfficiency,
} from "@/lib/cryo";
import { type LocalCryostat, useCryostats } from "@/lib/local/hooks";
import type { CryostatConfig } from "@/lib/schemas/cryostat";

/** "20C_1atm" → "20 °C, 1 atm". */
export const refLabel = (r: string | undefined) =>
  (r ?? "").replace("C_", " °C, ").replace("1atm", "1 atm").replace("100kPa", "100 kPa");
export const REFERENCE_OPTIONS = GAS_REFERENCES.map((r) => ({ value: r, label: refLabel(r) }));

const CRYOGEN_FIELD = {
  kind: "select",
  key: "cry",
  label: "Cryogen",
  initial: "helium",
  options: [
    { value: "helium", label: "Helium" },
    { value: "nitrogen", label: "Nitrogen" },
  ],
} as const;
const TIME_UNITS = [
  { value: "d", label: "days" },
  { value: "h", label: "hours" },
];

function PresetPicker({
  label,
  value,
  onChange,
  options,
}: {
  label: string;
  value: string;
  onChange: (v: string) => void;
  options: Choice[];
}) {
  return (
    <label className="flex flex-wrap items-center gap-3 font-semibold">
      {label}
      <select
        className="min-h-12 rounded-xl border-2 border-line bg-bg px-3 py-2 text-lg text-ink focus:border-accent"
        value={value}
        onChange={(e) => onChange(e.target.value)}
      >
        <OptionList options={options} />
      </select>
    </label>
  );
}

/** The bath's pressure or temperature; both empty: the normal boiling point (1 atm). */
const BATH_FIELDS = [
  {
    key: "bp",
    label: "Bath pressure (empty: 1 atm)",
    unit: "mbar",
    initial: "",
    optional: true,
    match: /^Bath pressure|below vacuum/,
  },
  ...readsFields("absolute"),
  { key: "bt", label: "…or bath temperature", unit: "K", initial: "", optional: true, match: /^Bath temperature/ },
] as const;

function bathFrom({ n, s }: Inputs): BathState | undefined {
  if (Number.isFinite(n.bp))
    return { pressurePa: absolutePressurePa(n.bp! * 100, s.reads as PressureReading, n.baro! * 100) };
  if (Number.isFinite(n.bt)) return { temperatureK: n.bt! };
  return undefined;
}

function liquidRows(l: SaturatedLiquid): ResultRow[] {
  return [
    {
      label: "Liquid taken at",
      text: l.atNormalBoilingPoint
        ? `1 atm only: normal boiling point, ${figure(l.temperatureK, 4)} K`
        : `${figure(l.temperatureK, 4)} K, ${figure(l.pressurePa / 100, 4)} mbar absolute (saturated)`,
    },
    {
      label: "Density, latent heat",
      text: `${figure(l.liquidDensityKgPerM3, 5)} kg/m³, ${figure(l.latentHeatJPerKg / 1000, 4)} kJ/kg`,
    },
  ];
}

const bathNote = (cryogen: "helium" | "nitrogen") => {
  const r = SATURATION_RANGE[cryogen];
  return `A bath's pressure or temperature is taken from the equation-of-state saturation table (${cryogen}: ${figure(r.temperatureMinK)}–${figure(r.temperatureMaxK)} K); outside it nothing is given, the 1 atm figures included.`;
};

const CUSTOM_LEVEL: LevelCalibration = { kind: "linear", litresPerPercent: 1, offsetLitres: 0 };

function calibrationText(c: LevelCalibration): string {
  return c.kind === "linear"
    ? `linear: ${figure(c.litresPerPercent)} L per %, offset ${figure(c.offsetLitres)} L`
    : `table: ${c.points.map((p) => `${figure(p.percent)} % = ${figure(p.litres)} L`).join("; ")}`;
}

export function HeliumSection() {
  const list = useCryostats() ?? [];
  const withReservoir = list.filter(
    (
      c,
    ): c is LocalCryostat & {
      config: CryostatConfig & { reservoir: NonNullable<CryostatConfig["reservoir"]> };
    } => Boolean(c.config.reservoir),
  );
  const [preset, setPreset] = useState("");
  const chosen = withReservoir.find((c) => c.id === preset) ?? withReservoir[0];
  const calibration: LevelCalibration = chosen?.config.reservoir.calibration ?? CUSTOM_LEVEL;
  const minimumPercent = chosen?.config.reservoir.minimumPercent ?? 25;
  return (
    <>
      <div className="flex flex-col gap-2 lg:col-span-2">
        {withReservoir.length > 0 ? (
          <PresetPicker
            label="Reservoir"
            value={chosen?.id ?? ""}
            onChange={setPreset}
            options={withReservoir.map((c) => ({
              value: c.id,
              label: `${c.name} (${figure(c.config.reservoir.capacityLitres)} L)`,
            }))}
          />
        ) : (
          <p className="text-base text-muted">
            No cryostats remembered on this tablet yet: a 1 L per % reservoir is assumed.
          </p>
        )}
        <p className="text-base text-muted">
          Level calibration — {calibrationText(calibration)}; minimum {figure(minimumPercent)} %.
        </p>
      </div>
      <Calculator
        key={`level-${chosen?.id ?? "custom"}`}
        title="Level → litres"
        fields={[{ key: "pct", label: "Level", unit: "%", initial: "50", match: /^Level/ }]}
        compute={({ n }) => [{ label: "Liquid helium", text: `${figure(litresFromLevel(n.pct!, calibration), 4)} L` }]}
      />
      <Calculator
        key={`boil-${chosen?.id ?? "custom"}`}
        title="Boil-off and days left"
        intro="Level readings since the last transfer: time in days (or hours, see below) and level in %. A least-squares line; a rise means a fill inside the data."
        fields={[
          {
            kind: "text",
            key: "data",
            label: "Readings (time, level %)",
            initial: "0  62.0\n1  56.7\n2  51.9\n3  46.4\n4  41.5",
            rows: 5,
            match: /Reading|readings|line \d/,
          },
          { kind: "select", key: "tu", label: "Time unit", initial: "d", options: TIME_UNITS },
          { key: "min", label: "Minimum level", unit: "%", initial: String(minimumPercent), match: /^Level|Minimum/ },
        ]}
        compute={({ n, s }) => {
          const scale = s.tu === "h" ? 3_600_000 : 86_400_000;
          const pairs = parsePairs(s.data ?? "", "Readings");
          const history = pairs.map(([t, pct]) => ({ timeMs: t * scale, litres: litresFromLevel(pct, calibration) }));
          const rate = boilOffRate(history);
          const last = history.at(-1)!;
          const minL = litresFromLevel(n.min!, calibration);
          const f = forecastMinimumLevel(rate, minL, last.timeMs);
          return [
            {
              label: "Boil-off",
              text: `${figure(rate.litresPerDay, 3)} ± ${figure(rate.standardErrorLitresPerDay, 2)} L/day`,
            },
            { label: "Now (last reading)", text: `${figure(last.litres, 3)} L` },
            f.forecast
              ? {
                  label: `Days from the last reading to ${figure(n.min!)} %`,
                  text: `${figure(f.daysLeft, 3)} d (${figure(f.daysLeftEarliest, 3)}–${f.daysLeftLatest === null ? "?" : figure(f.daysLeftLatest, 3)})`,
                  tone: f.daysLeft < 3 ? "warn" : undefined,
                }
              : { label: "Forecast", text: f.reason },
            { label: "Fit residual (rms)", text: `${figure(rate.residualRmsLitres, 2)} L` },
          ];
        }}
      />
      <Calculator
        title="Weighed dewar → litres"
        intro="Net mass (gross minus tare) of liquid helium, at the liquid density of the dewar's pressure or temperature; left empty, at the normal boiling point (0.1247 kg/L, 1 atm only)."
        fields={[{ key: "kg", label: "Net mass", unit: "kg", initial: "12.5", match: /mass/i }, ...BATH_FIELDS]}
        compute={(inputs) => {
          const m = litresFromMassAt(inputs.n.kg!, bathFrom(inputs));
          return [{ label: "Liquid helium", text: `${figure(m.litres, 4)} L` }, ...liquidRows(m.liquid)];
        }}
        footer={<p className="text-base text-muted">{bathNote("helium")}</p>}
      />
      <Calculator
        title="Liquid → gas"
        fields={[
          { key: "l", label: "Liquid", unit: "L", initial: "100", match: /Liquid/ },
          { kind: "select", key: "ref", label: "Gas at", initial: "20C_1atm", options: REFERENCE_OPTIONS },
          CRYOGEN_FIELD,
        ]}
        compute={({ n, s }) => {
          const g = gasLitresFromLiquid(n.l!, s.ref as GasReference, s.cry as "helium" | "nitrogen");
          return [
            {
              label: `Gas at ${refLabel(s.ref)}`,
              text: `${figure(g.gasLitres / 1000, 4)} m³ (${figure(g.gasLitres, 5)} L)`,
            },
            { label: "Expansion ratio", text: `1 : ${figure(g.expansionRatio, 4)}` },
          ];
        }}
      />
      <Calculator
        title="Transfer efficiency"
        fields={[
          { key: "gained", label: "Gained in the cryostat", unit: "L", initial: "48", match: /gained/i },
          { key: "taken", label: "Taken from the supply", unit: "L", initial: "66", match: /taken|supply/i },
        ]}
        compute={({ n }) => {
          const t = transferEfficiency(n.gained!, n.taken!);
          return [
            {
              label: "Efficiency",
              text: `${figure(t.efficiency * 100, 3)} %`,
              tone: t.exceedsSupply ? "danger" : undefined,
            },
            {
              label: "Lost",
              text: t.exceedsSupply
                ? "More arrived than was taken: check both readings"
                : `${figure(t.lossLitres, 3)} L`,
            },
          ];
        }}
        footer={
          <p className="text-base text-muted">
            Losses of 20–40 % are common practice for a transfer through a warm line.
          </p>
        }
      />
      <Calculator
        title="Heat load → boil-off"
        fields={[
          { key: "w", label: "Heat load", unit: "W", initial: "0.1", match: /Heat/ },
          CRYOGEN_FIELD,
          ...BATH_FIELDS,
        ]}
        compute={(inputs) => {
          const b = boilOffFromHeatLoad(inputs.n.w!, inputs.s.cry as "helium" | "nitrogen", bathFrom(inputs));
          return [
            { label: "Boil-off", text: `${figure(b.litresPerHour, 3)} L/h` },
            { label: "Per day", text: `${figure(b.litresPerDay, 3)} L/day` },
            ...liquidRows(b.liquid),
          ];
        }}
        footer={
          <p className="text-base text-muted">
            Q/(ρ·L), liquid litres at the bath&apos;s condition; at 1 atm, 1 W ≈ 1.4 L/h of liquid helium.{" "}
            {bathNote("helium")} Nitrogen: {figure(SATURATION_RANGE.nitrogen.temperatureMinK)}–
            {figure(SATURATION_RANGE.nitrogen.temperatureMaxK)} K.
          </p>
        }
      />
    </>
  );
}

const CUSTOM_MAGNET: MagnetSpec & { inductanceH: number; rampLimitTPerMin: number; dipoleMomentAm2?: number } = {
  coilConstantTPerA: 0.1,
  maxCurrentA: 100,
  inductanceH: 10,
  rampLimitTPerMin: 0.1,
};

export function MagnetSection() {
  const list = useCryostats() ?? [];
  const magnets = list.filter((c) => c.config.magnet);
  const [preset, setPreset] = useState("");
  const chosen = magnets.find((c) => c.id === preset) ?? magnets[0];
  const m = chosen?.config.magnet ?? CUSTOM_MAGNET;
  const key = chosen?.id ?? "custom";
  const specFields = [
    { key: "k", label: "Coil constant", unit: "T/A", initial: String(m.coilConstantTPerA), match: /Coil constant/ },
    { key: "imax", label: "Maximum current", unit: "A", initial: String(m.maxCurrentA), match: /Maximum current/ },
  ];
  const spec = (n: Record<string, number>): MagnetSpec => ({
    coilConstantTPerA: n.k!,
    maxCurrentA: n.imax!,
    rampLimitTPerMin: n.rate!,
  });
  const caution = <EstimateNote topic="magnet" />;
  return (
    <>
      <div className="flex flex-col gap-2 lg:col-span-2">
        <Caution
          topic="magnet"
          {...(chosen
            ? { cryostatId: chosen.id, cryostatName: chosen.name, makerRampLimitTPerMin: m.rampLimitTPerMin }
            : {})}
        />
        {magnets.length > 0 ? (
          <PresetPicker
            label="Magnet"
            value={key}
            onChange={setPreset}
            options={magnets.map((c) => ({ value: c.id, label: c.name }))}
          />
        ) : (
          <p className="text-base text-muted">
            No cryostats remembered on this tablet yet: enter the magnet's figures.
          </p>
        )}
      </div>
      <Calculator
        key={`field-${key}`}
        title="Current ↔ field"
        fields={[
          ...specFields,
          { key: "rate", label: "Ramp limit", unit: "T/min", initial: String(m.rampLimitTPerMin), match: /Ramp rate/ },
          { key: "i", label: "Current", unit: "A", initial: "22.2", match: /^Current/ },
          {
            key: "b",
            label: "Target field",
            unit: "T",
            initial: String(Math.min(5, m.coilConstantTPerA * m.maxCurrentA)),
            match: /^Target|Field/,
          },
        ]}
        compute={({ n }) => {
          const s = spec(n);
          const fieldNow = fieldFromCurrent(n.i!, s);
          let target: number;
          try {
            target = currentFromField(n.b!, s);
          } catch (e) {
            throw new RangeError(`Target field ${figure(n.b!)} T is beyond the magnet: ${(e as Error).message}`);
          }
          const ramp = rampTime(fieldNow, n.b!, n.rate!, s);
          return [
            { label: "Field at the current", text: `${figure(fieldNow, 4)} T` },
            { label: "Current for the target", text: `${figure(target, 4)} A` },
            {
              label: `Ramp ${figure(fieldNow, 3)} → ${figure(n.b!, 3)} T at the limit`,
              text: durationText(ramp.minutes),
            },
          ];
        }}
        footer={caution}
      />
      <Calculator
        key={`energy-${key}`}
        title="Stored energy and quench boil-off"
        fields={[
          { key: "l", label: "Inductance", unit: "H", initial: String(m.inductanceH), match: /Inductance/ },
          { key: "i", label: "Current", unit: "A", initial: String(m.maxCurrentA), match: /Current/ },
        ]}
        compute={({ n }) => {
          const e = storedEnergyJ(n.l!, n.i!);
          const litres = quenchBoilOffLitresMax(e);
          return [
            { label: "Stored energy ½LI²", text: `${figure(e / 1000, 4)} kJ` },
            { label: "Helium boiled, at most", text: `${figure(litres, 3)} L liquid` },
            {
              label: "As gas at 20 °C, 1 atm",
              text: `${figure(gasLitresFromLiquid(litres, "20C_1atm").gasLitres / 1000, 3)} m³`,
            },
          ];
        }}
        footer={
          <>
            <p className="text-base text-muted">
              Upper bound: all stored energy into latent heat. A real quench puts part of it into the coil and the dump
              resistor.
            </p>
            {caution}
          </>
        }
      />
      <Calculator
        key={`fringe-${key}`}
        title="Controlled-area line (fringe field)"
        intro="Distance from the magnet centre to a field contour, from the dipole far field: give the dipole moment, or a field measured at a distance on the axis."
        fields={[
          {
            key: "mom",
            label: "Dipole moment",
            unit: "A·m²",
            initial:
              chosen?.config.magnet?.dipoleMomentAm2 !== undefined ? String(chosen.config.magnet.dipoleMomentAm2) : "",
            optional: true,
            match: /Dipole/,
          },
          {
            key: "bf",
            label: "…or field measured on the axis",
            unit: "mT",
            initial: "",
            optional: true,
            match: /^Field/,
          },
          { key: "d", label: "…at distance", unit: "m", initial: "", optional: true, match: /Distance/ },
          { key: "c", label: "Contour", unit: "mT", initial: "0.5", match: /Contour/ },
        ]}
        compute={({ n }) => {
          const contourT = n.c! / 1000;
          const source = Number.isFinite(n.mom)
            ? { dipoleMomentAm2: n.mom! }
            : Number.isFinite(n.bf) && Number.isFinite(n.d)
              ? { fieldT: n.bf! / 1000, distanceM: n.d!, direction: "axis" as const }
              : null;
          if (!source)
            return [{ label: "Contour distance", text: "Enter the dipole moment, or a field and its distance" }];
          const est = contourDistance(source, contourT);
          return [
            { label: `${figure(n.c!)} mT line on the axis`, text: `≈ ${figure(est.axisDistanceM, 3)} m` },
            { label: `${figure(n.c!)} mT line at the side (equator)`, text: `≈ ${figure(est.equatorDistanceM, 3)} m` },
            { label: "Dipole moment used", text: `${figure(est.dipoleMomentAm2, 3)} A·m²` },
          ];
        }}
        footer={
          <>
            <p className="text-base text-muted">
              0.5 mT: IEC 60601-2-33 up to its 3rd edition (the 4th uses 0.9 mT); the facility sets its own line.
            </p>
            <EstimateNote topic="fringe" />
          </>
        }
      />
    </>
  );
}
