"use client";
// Thermometry calculators: ITS-90 helium vapour pressure, IEC 60751 platinum sensors, and a
// pasted sensor calibration table.
import Link from "next/link";
import { Calculator, PRESSURE_OPTIONS, PRESSURE_UNITS } from "@/components/cryo/calc-kit";
import { figure, temperatureText } from "@/components/cryo/derive";
import {
  convertReading,
  HE3_RANGE,
  HE4_RANGE,
  he3PressureFromTemperature,
  he3TemperatureFromPressure,
  he4PressureFromTemperature,
  he4TemperatureFromPressure,
  parseCalibration,
  ptResistance,
  ptTemperature,
  ptToleranceC,
  type SensorKind,
} from "@/lib/cryo";
import { COLUMN_ORDER_OPTIONS, SENSOR_KIND_LABEL } from "@/lib/schemas/calibration";

const ISOTOPES = [
  { value: "he4", label: "⁴He (1.25–5.0 K)" },
  { value: "he3", label: "³He (0.65–3.2 K)" },
];

const pressureRows = (pa: number) => [
  { label: "Pressure (Pa)", text: `${figure(pa, 6)} Pa` },
  { label: "Pressure (mbar)", text: `${figure(pa / 100, 6)} mbar` },
  { label: "Pressure (Torr)", text: `${figure(pa / PRESSURE_UNITS.Torr!, 6)} Torr` },
];

export function Its90Section() {
  return (
    <>
      <Calculator
        title="Vapour pressure → temperature"
        intro={
          <>
            ITS-90 helium vapour-pressure scale (Metrologia 27, 3 (1990)). Saturated vapour only: a pot or bath, read at
            the liquid.
          </>
        }
        fields={[
          { kind: "select", key: "iso", label: "Isotope", initial: "he4", options: ISOTOPES },
          { kind: "select", key: "unit", label: "Pressure unit", initial: "mbar", options: PRESSURE_OPTIONS },
          { key: "p", label: "Pressure", initial: "1013.25", match: /vapour pressure|finite/ },
        ]}
        compute={({ n, s }) => {
          const pa = n.p! * (PRESSURE_UNITS[s.unit!] ?? NaN);
          const k = s.iso === "he3" ? he3TemperatureFromPressure(pa) : he4TemperatureFromPressure(pa);
          return [{ label: "Temperature T90", text: `${figure(k, 6)} K` }, ...pressureRows(pa)];
        }}
      />
      <Calculator
        title="Temperature → vapour pressure"
        fields={[
          { kind: "select", key: "iso", label: "Isotope", initial: "he4", options: ISOTOPES },
          { key: "t", label: "Temperature", unit: "K", initial: "1.5", match: /temperature|finite/i },
        ]}
        compute={({ n, s }) => {
          const pa = s.iso === "he3" ? he3PressureFromTemperature(n.t!) : he4PressureFromTemperature(n.t!);
          return pressureRows(pa);
        }}
        footer={
          <p className="text-base text-muted">
            Ranges: ⁴He {HE4_RANGE.temperatureMinK}–{HE4_RANGE.temperatureMaxK} K ({figure(HE4_RANGE.pressureMinPa, 4)}–
            {figure(HE4_RANGE.pressureMaxPa, 4)} Pa); ³He {HE3_RANGE.temperatureMinK}–{HE3_RANGE.temperatureMaxK} K.
            Outside them the scale defines nothing, and nothing is extrapolated.
          </p>
        }
      />
    </>
  );
}

const R0_OPTIONS = [
  { value: "100", label: "Pt100 (R0 = 100 Ω)" },
  { value: "1000", label: "Pt1000 (R0 = 1000 Ω)" },
];

const R0_FIELD = { kind: "select", key: "r0", label: "Sensor", initial: "100", options: R0_OPTIONS } as const;
/** IEC 60751 class A and B tolerances at a temperature (°C). */
const toleranceRow = (c: number) => ({
  label: "Class A / B tolerance",
  text: `±${figure(ptToleranceC(c, "A"), 3)} / ±${figure(ptToleranceC(c, "B"), 3)} °C`,
});

export function PlatinumSection() {
  return (
    <>
      <Calculator
        title="Platinum sensor: resistance → temperature"
        intro="IEC 60751 (Callendar–Van Dusen), −200…850 °C. Below −200 °C the standard says nothing: use a calibrated sensor."
        fields={[
          R0_FIELD,
          { key: "r", label: "Resistance", unit: "Ω", initial: "20.2465", match: /^Resistance|finite/ },
        ]}
        compute={({ n, s }) => {
          const c = ptTemperature(n.r!, Number(s.r0));
          return [
            { label: "Temperature", text: `${figure(c, 6)} °C` },
            { label: "Temperature", text: `${figure(c + 273.15, 6)} K` },
            toleranceRow(c),
          ];
        }}
      />
      <Calculator
        title="Platinum sensor: temperature → resistance"
        fields={[
          R0_FIELD,
          { key: "t", label: "Temperature", unit: "°C", initial: "-196", match: /^Temperature|finite/ },
        ]}
        compute={({ n, s }) => [
          { label: "Resistance", text: `${figure(ptResistance(n.t!, Number(s.r0)), 6)} Ω` },
          toleranceRow(n.t!),
        ]}
      />
    </>
  );
}

export const SENSOR_KINDS = (
  ["ruthenium-oxide", "germanium", "carbon", "silicon-diode"] as const satisfies readonly SensorKind[]
).map((k) => ({ value: k, label: SENSOR_KIND_LABEL[k] }));

const EXAMPLE_TABLE = `# T (K)   R (Ω) — an example ruthenium-oxide curve
0.010  21500
0.020  12600
0.050   6900
0.100   4600
0.300   2900
1.000   2100
4.200   1640`;

export function CalibrationSection() {
  return (
    <Calculator
      title="Sensor calibration table"
      wide
      intro={
        <>
          Paste a two-column table (CSV or spaces; # comments and a header line allowed). Monotone cubic interpolation,
          in log–log for resistors; nothing outside the table. To keep a table for a thermometer channel, use{" "}
          <Link href="/calibrations" className="inline-flex min-h-12 items-center font-semibold text-accent underline">
            Sensor calibrations
          </Link>
          .
        </>
      }
      fields={[
        { kind: "select", key: "kind", label: "Sensor kind", initial: "ruthenium-oxide", options: SENSOR_KINDS },
        { kind: "select", key: "cols", label: "Columns", initial: "auto", options: COLUMN_ORDER_OPTIONS },
        {
          kind: "text",
          key: "table",
          label: "Table",
          initial: EXAMPLE_TABLE,
          rows: 8,
          match: /^Line|calibration table needs/,
        },
        { key: "reading", label: "Reading (Ω, or V for a diode)", initial: "3500", match: /^Reading/ },
      ]}
      compute={({ n, s }) => {
        const table = parseCalibration(s.table ?? "", {
          sensorKind: s.kind as SensorKind,
          ...(s.cols === "auto" ? {} : { columns: s.cols as "temperature-value" | "value-temperature" }),
        });
        const k = convertReading(table, n.reading!);
        return [
          { label: "Temperature", text: temperatureText(k) },
          {
            label: "Table",
            text: `${table.points.length} points, ${figure(table.range.valueMin)}–${figure(table.range.valueMax)} ${table.valueUnit}, ${temperatureText(table.range.temperatureMinK)}–${temperatureText(table.range.temperatureMaxK)}`,
          },
        ];
      }}
    />
  );
}
