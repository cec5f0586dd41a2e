"use client";
import { Calculator, PRESSURE_OPTIONS, PRESSURE_UNITS, type ResultRow, readsFields } from "@/components/cryo/calc-kit";
import { durationText, figure } from "@/components/cryo/derive";
import { EstimateNote } from "@/components/cryo/estimate-note";
import { Caution } from "@/components/safety/caution";
// Oxygen deficiency estimates (room B-014 defaults: 220 m³, 4 air changes per hour) and gas
// accounting (tank amounts, mixture loss between warmup and cooldown).
import {
  absolutePressurePa,
  classifyOxygen,
  continuousReleaseOxygen,
  type GasReference,
  gasAmount,
  gasLitresFromLiquid,
  heliumCompressibility20C,
  MOLAR_VOLUME_REFERENCES,
  type MolarVolumeReference,
  mixtureLoss,
  type OxygenEstimate,
  type PressureReading,
  quenchGasVolume,
  type SuddenRelease,
  steadyStateOxygen,
  suddenReleaseOxygen,
  timeToOxygenFraction,
  type VentilationKind,
  ventilationFromAirChanges,
} from "@/lib/cryo";
import { REFERENCE_OPTIONS, refLabel } from "./helium-magnet";

/** The demo room's free volume and ventilation (room B-014); the facility's own figures replace them. */
export const ROOM_DEFAULTS = { volumeM3: 220, airChangesPerHour: 4 };

const STATUS_TEXT = {
  normal: "normal",
  alarm: "below the alarm point",
  evacuate: "leave the room",
  enriched: "oxygen-enriched",
} as const;

function oxygenRow(label: string, fraction: number): ResultRow {
  const c = classifyOxygen(fraction);
  return {
    label,
    // Two decimals, so a figure just below a threshold never reads as the threshold itself.
    text: `${(fraction * 100).toFixed(2)} % O₂ — ${STATUS_TEXT[c.status]}`,
    tone: c.status === "normal" ? "ok" : c.status === "alarm" ? "warn" : "danger",
  };
}

/** Both sudden-release figures, each named by its model, the conservative one first. */
function suddenRows(release: SuddenRelease): ResultRow[] {
  const s = suddenReleaseOxygen(release);
  return s.estimates.map((e: OxygenEstimate) =>
    oxygenRow(e === s.conservative ? `${e.label} — conservative figure` : e.label, e.fraction),
  );
}

const VENTILATION_OPTIONS: { value: VentilationKind; label: string }[] = [
  { value: "supply", label: "Supply: fresh air blown in" },
  { value: "exhaust", label: "Exhaust: room air extracted" },
];

const caution = <EstimateNote topic="oxygen" />;
const thresholds = (
  <p className="text-base text-muted">
    Fresh air 20.9 % O₂. Alarm below 19.5 % (OSHA 29 CFR 1910.146: oxygen-deficient below it), leave below 18 % (common
    practice) — the facility sets its own points.
  </p>
);

export function OxygenSection() {
  return (
    <>
      <Caution topic="oxygen" className="lg:col-span-2" />
      <Calculator
        title="Sudden release"
        intro="A volume of gas released at once into the room. Two models: the gas pushes room air out unmixed (the worst case), or it mixes in while mixed air leaves — the same well-mixed room as the continuous release, released fast."
        fields={[
          {
            key: "v",
            label: "Room free volume",
            unit: "m³",
            initial: String(ROOM_DEFAULTS.volumeM3),
            match: /Room volume/,
          },
          { key: "g", label: "Gas released (room conditions)", unit: "m³", initial: "20", match: /Released/ },
        ]}
        compute={({ n }) => suddenRows({ roomVolumeM3: n.v!, gasVolumeM3: n.g! })}
        footer={
          <>
            {thresholds}
            {caution}
          </>
        }
      />
      <Calculator
        title="Continuous release with ventilation"
        intro="Well-mixed room: fresh air and gas come in, the same volume of mixed air leaves. With exhaust ventilation the fresh air drawn in is the extract minus the release, so the room fares worse than with the same supply."
        fields={[
          {
            key: "v",
            label: "Room free volume",
            unit: "m³",
            initial: String(ROOM_DEFAULTS.volumeM3),
            match: /Room volume/,
          },
          {
            key: "ach",
            label: "Air changes",
            unit: "per hour",
            initial: String(ROOM_DEFAULTS.airChangesPerHour),
            match: /Air changes|Ventilation/,
          },
          { kind: "select", key: "kind", label: "Ventilation", initial: "exhaust", options: VENTILATION_OPTIONS },
          { key: "r", label: "Release rate (gas)", unit: "m³/min", initial: "1", match: /Release rate/ },
          { key: "t", label: "After", unit: "min", initial: "10", match: /Time/ },
        ]}
        compute={({ n, s }) => {
          const release = {
            roomVolumeM3: n.v!,
            releaseM3PerS: n.r! / 60,
            ventilationM3PerS: ventilationFromAirChanges(n.v!, n.ach!),
            ventilationKind: s.kind as VentilationKind,
          };
          const at = continuousReleaseOxygen(release, n.t! * 60);
          const to = timeToOxygenFraction(release, 0.195);
          return [
            oxygenRow(`After ${figure(n.t!)} min — ${at.label}`, at.fraction),
            oxygenRow("Settles at", steadyStateOxygen(release)),
            to.reached
              ? { label: "Reaches 19.5 % after", text: durationText(to.timeS / 60), tone: "warn" }
              : { label: "Reaches 19.5 %", text: "never at this release and ventilation", tone: "ok" },
          ];
        }}
        footer={
          <>
            {thresholds}
            {caution}
          </>
        }
      />
      <Calculator
        title="Quench or loss of vacuum: whole inventory"
        intro="All liquid of a cryostat boils into the room (no recovery line, no vent to outside)."
        fields={[
          { key: "l", label: "Liquid helium in the cryostat", unit: "L", initial: "90", match: /Liquid/ },
          {
            key: "v",
            label: "Room free volume",
            unit: "m³",
            initial: String(ROOM_DEFAULTS.volumeM3),
            match: /Room volume/,
          },
          { kind: "select", key: "ref", label: "Gas at", initial: "20C_1atm", options: REFERENCE_OPTIONS },
        ]}
        compute={({ n, s }) => {
          const gas = quenchGasVolume(n.l!, s.ref as GasReference);
          return [
            { label: "Helium gas", text: `${figure(gas.gasM3, 3)} m³ at ${refLabel(s.ref)}` },
            ...suddenRows({ roomVolumeM3: n.v!, gasVolumeM3: gas.gasM3 }),
          ];
        }}
        footer={
          <>
            <p className="text-base text-muted">
              Helium rises and collects under the ceiling; a low room or a pit holds cold gas for a while.{" "}
              {`Liquid → gas uses the ${figure(gasLitresFromLiquid(1, "20C_1atm").expansionRatio, 4)}:1 ratio at 20 °C.`}
            </p>
            {caution}
          </>
        }
      />
    </>
  );
}

const MOLAR_OPTIONS = MOLAR_VOLUME_REFERENCES.map((r) => ({ value: r, label: refLabel(r) }));

const absoluteText = (pa: number) => `${figure(pa / 1e5, 5)} bar (${figure(pa / 100, 5)} mbar)`;

export function GasSection() {
  return (
    <>
      <Calculator
        title="Gas in a tank or cylinder"
        intro="n = pV/(ZRT) takes the absolute pressure. Cylinder gauges usually read gauge pressure (above the room's air): the room's barometric pressure is then added. For helium at 20 °C the compressibility Z is taken from the equation of state (1–300 bar) unless you give one."
        fields={[
          { kind: "select", key: "unit", label: "Pressure unit", initial: "bar", options: PRESSURE_OPTIONS },
          { key: "p", label: "Pressure as read", initial: "200", match: /^Pressure/ },
          ...readsFields("gauge"),
          { key: "v", label: "Volume", unit: "L", initial: "50", match: /volume/i },
          { key: "t", label: "Temperature", unit: "°C", initial: "20", match: /^Temperature/ },
          {
            key: "z",
            label: "Compressibility Z (empty: helium table at 20 °C, else 1)",
            initial: "",
            optional: true,
            match: /Compressibility/,
          },
          { kind: "select", key: "ref", label: "Litres at", initial: "0C_1atm", options: MOLAR_OPTIONS },
        ]}
        compute={({ n, s }) => {
          const pa = absolutePressurePa(
            n.p! * (PRESSURE_UNITS[s.unit!] ?? NaN),
            s.reads as PressureReading,
            n.baro! * 100,
          );
          let z = n.z!;
          let zNote = "given";
          if (!Number.isFinite(z)) {
            if (Math.abs(n.t! - 20) < 0.5 && pa >= 1e5) {
              z = heliumCompressibility20C(pa);
              zNote = "helium at 20 °C";
            } else {
              z = 1;
              zNote = "ideal gas";
            }
          }
          const g = gasAmount(
            { pressurePa: pa, volumeLitres: n.v!, temperatureK: n.t! + 273.15, compressibilityZ: z },
            s.ref as MolarVolumeReference,
          );
          return [
            { label: "Absolute pressure used", text: absoluteText(pa) },
            { label: "Amount", text: `${figure(g.mol, 4)} mol` },
            { label: `Gas at ${refLabel(s.ref)}`, text: `${figure(g.litresAtReference, 4)} L` },
            {
              label: "Z used",
              text: `${figure(z, 4)} (${zNote})`,
              tone: zNote === "ideal gas" && pa > 5e5 ? "warn" : undefined,
            },
          ];
        }}
        footer={
          <p className="text-base text-muted">
            A gauge reading needs the room&apos;s barometric pressure (1013.25 hPa is the standard atmosphere; the
            room&apos;s own barometer is better). High-pressure cylinders: the usual cylinder cautions, the
            supplier&apos;s instructions and the facility&apos;s rules apply.
          </p>
        }
      />
      <Calculator
        title="Mixture loss (warmup → next cooldown)"
        intro="The same storage tank read twice with all the mixture in it."
        fields={[
          { key: "v", label: "Tank volume", unit: "L", initial: "40", match: /Tank volume/ },
          ...readsFields("absolute"),
          { key: "p1", label: "Pressure before", unit: "mbar", initial: "812", match: /^Pressure.*before|^Pressure/ },
          { key: "t1", label: "Temperature before", unit: "K", initial: "295", match: /^Temperature/ },
          { key: "p2", label: "Pressure after", unit: "mbar", initial: "806" },
          { key: "t2", label: "Temperature after", unit: "K", initial: "295" },
        ]}
        compute={({ n, s }) => {
          const abs = (mbar: number) => absolutePressurePa(mbar * 100, s.reads as PressureReading, n.baro! * 100);
          const loss = mixtureLoss(
            n.v!,
            { pressurePa: abs(n.p1!), temperatureK: n.t1! },
            { pressurePa: abs(n.p2!), temperatureK: n.t2! },
          );
          return [
            {
              label: "Lost",
              text: `${figure(loss.litresLost, 3)} L at 0 °C, 1 atm`,
              tone: loss.litresLost < 0 ? "warn" : undefined,
            },
            { label: "Share of the mixture", text: `${figure(loss.percentLost, 3)} %` },
            {
              label: "Before / after",
              text: `${figure(loss.before.litresAtReference, 4)} / ${figure(loss.after.litresAtReference, 4)} L`,
            },
          ];
        }}
        footer={
          <p className="text-base text-muted">A negative loss means the tank gained gas: look for air leaking in.</p>
        }
      />
    </>
  );
}
