// Sensor calibration tables: parsing rules, and Fritsch–Carlson monotone interpolation (SIAM J.
// Numer. Anal. 17, 238 (1980)) checked on curves where the exact answer is known: a power law
// R ∝ T^−k is a straight line in log–log and must be reproduced exactly; a linear diode curve too.
// The tables below are invented demo sensors, not a maker's data.
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { CryoInputError, convertReading, parseCalibration } from "@/lib/cryo";

const RUOX_CSV = `# Larchmere demo RuOx "MXC-2" (invented)
# columns: temperature, resistance
T(K), R(ohm)
0.010, 63245.55
0.050, 12649.11   # comment after data
0.200, 3162.28
1.000, 632.46
4.000, 158.11
`;
// R = 632.456·T^-1 exactly (T in K), i.e. log–log straight line

const DIODE_TXT = `V\tT
1.70\t2.0
1.50\t22.0
1.20\t52.0
1.00\t72.0
0.50\t122.0
`;
// T = 172 − 100·V exactly (linear)

describe("parseCalibration", () => {
  it("reads CSV with comments and a header, temperature first", () => {
    const table = parseCalibration(RUOX_CSV, { sensorKind: "ruthenium-oxide" });
    expect(table.points).toHaveLength(5);
    expect(table.quantity).toBe("resistance");
    expect(table.range).toEqual({ valueMin: 158.11, valueMax: 63245.55, temperatureMinK: 0.01, temperatureMaxK: 4 });
  });

  it("reads whitespace columns with the value first (from the header)", () => {
    const table = parseCalibration(DIODE_TXT, { sensorKind: "silicon-diode" });
    expect(table.valueUnit).toBe("V");
    expect(table.range.temperatureMaxK).toBe(122);
    expect(table.range.valueMin).toBe(0.5);
  });

  it("an explicit column order wins over the header guess", () => {
    const table = parseCalibration("10 2000\n20 1000\n30 500\n", {
      sensorKind: "germanium",
      columns: "value-temperature",
    });
    expect(table.range.temperatureMaxK).toBe(2000);
  });

  it.each([
    ["1 100\n2 50\n2 40\n", /Line 3: duplicate temperature 2 K \(also on line 2\)/],
    ["1 100\n2 50\n3 50\n", /Line 3: duplicate value 50/],
    ["1 100\n2 50\n3 60\n", /Line 3: value 60 is not monotonic/],
    ["1 100\n3 50\n2 40\n", /Line 3: temperature 2 K breaks the order/],
    ["T R\n1 100\nabc 50\n3 40\n", /Line 3: cannot read "abc 50"/],
    ["1 100 7\n2 50\n3 40\n", /Line 1: expected 2 columns, found 3/],
    ["1 100\n2 50\n", /at least 3 points \(found 2\)/],
    ["1 100\n2 -50\n3 40\n", /Line 2: value must be > 0/],
  ])("refuses bad input %#", (text, message) => {
    expect(() => parseCalibration(text, { sensorKind: "carbon" })).toThrow(CryoInputError);
    expect(() => parseCalibration(text, { sensorKind: "carbon" })).toThrow(message);
  });
});

describe("convertReading", () => {
  const ruox = parseCalibration(RUOX_CSV, { sensorKind: "ruthenium-oxide" });
  const diode = parseCalibration(DIODE_TXT, { sensorKind: "silicon-diode" });

  it("reproduces the table's own points", () => {
    for (const p of ruox.points) expect(convertReading(ruox, p.value)).toBeCloseTo(p.temperatureK, 9);
    for (const p of diode.points) expect(convertReading(diode, p.value)).toBeCloseTo(p.temperatureK, 9);
  });

  it("is exact for a power law between points (log–log interpolation)", () => {
    for (const t of [0.015, 0.1, 0.5, 2.5]) {
      // the table is rounded to 0.01 Ω, so agree to ~1e-5
      expect(convertReading(ruox, 632.456 / t) / t).toBeCloseTo(1, 4);
    }
  });

  it("is exact for a linear diode curve between points (linear in V, T)", () => {
    for (const v of [0.6, 1.1, 1.33, 1.65]) expect(convertReading(diode, v)).toBeCloseTo(172 - 100 * v, 9);
  });

  it("refuses readings outside the table, naming its range", () => {
    expect(() => convertReading(ruox, 100)).toThrow(RangeError);
    expect(() => convertReading(ruox, 100)).toThrow(
      /below the calibration table's range \(158\.1–63250 Ω, 0\.01–4 K\)/,
    );
    expect(() => convertReading(diode, 1.8)).toThrow(/above the calibration table's range/);
    expect(() => convertReading(diode, Number.NaN)).toThrow(/finite/);
  });

  it("stays monotone between points for any monotone table (fast-check property)", () => {
    const tableArb = fc
      .uniqueArray(fc.double({ min: 0.01, max: 300, noNaN: true }), { minLength: 3, maxLength: 12 })
      .chain((ts) =>
        fc
          .array(fc.double({ min: 0.05, max: 3, noNaN: true }), { minLength: ts.length, maxLength: ts.length })
          .map((steps) => ({ ts: [...ts].sort((a, b) => a - b), steps })),
      );
    fc.assert(
      fc.property(tableArb, ({ ts, steps }) => {
        // an NTC curve: resistance falls with temperature by irregular factors
        let r = 1e5;
        const lines = ts.map((t, i) => {
          r /= 1 + (steps[i] ?? 1);
          return `${t} ${r}`;
        });
        const table = parseCalibration(lines.join("\n"), { sensorKind: "ruthenium-oxide" });
        const { valueMin, valueMax } = table.range;
        let previous = Number.POSITIVE_INFINITY;
        for (let k = 0; k <= 200; k++) {
          const value = valueMin * (valueMax / valueMin) ** (k / 200);
          const t = convertReading(table, Math.min(Math.max(value, valueMin), valueMax));
          expect(t).toBeLessThanOrEqual(previous * (1 + 1e-12));
          previous = t;
        }
      }),
    );
  });
});
