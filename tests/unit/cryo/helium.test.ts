// Liquid-helium bookkeeping against the CoolProp values in cryogens-eos.json ([eos]), the
// table in lib/cryo/README.md, simple-statistics (linear regression) and mathjs (matrix inverse for the
// slope's standard error). Rules of thumb are marked as common practice.
import * as math from "mathjs";
import * as ss from "simple-statistics";
import { describe, expect, it } from "vitest";
import {
  boilOffFromHeatLoad,
  boilOffRate,
  CryoInputError,
  forecastMinimumLevel,
  gasLitresFromLiquid,
  HELIUM_LIQUID_DENSITY_KG_PER_L,
  he4TemperatureFromPressure,
  type LevelReading,
  litresFromLevel,
  litresFromMass,
  litresFromMassAt,
  saturatedLiquid,
  transferEfficiency,
} from "@/lib/cryo";

const DAY_MS = 86_400_000;
const T0 = Date.UTC(2025, 2, 3, 8, 0, 0);

describe("litresFromLevel", () => {
  it("linear calibration: offset + litres per %", () => {
    expect(litresFromLevel(50, { kind: "linear", litresPerPercent: 0.9, offsetLitres: 2 })).toBeCloseTo(47, 12);
  });

  it("table calibration interpolates linearly between rows (neck of the Plover demo reservoir)", () => {
    const cal = {
      kind: "table" as const,
      points: [
        { percent: 0, litres: 0 },
        { percent: 80, litres: 80 },
        { percent: 100, litres: 90 },
      ],
    };
    expect(litresFromLevel(90, cal)).toBeCloseTo(85, 12);
    expect(litresFromLevel(40, cal)).toBeCloseTo(40, 12);
    expect(() => litresFromLevel(101, cal)).toThrow(/above the level table's range \(0–100 %\)/);
  });

  it("refuses impossible readings and broken tables", () => {
    const linear = { kind: "linear" as const, litresPerPercent: 1, offsetLitres: 0 };
    expect(() => litresFromLevel(-1, linear)).toThrow(/below the level meter's range \(0–100 %\)/);
    expect(() => litresFromLevel(Number.NaN, linear)).toThrow(RangeError);
    const bad = {
      kind: "table" as const,
      points: [
        { percent: 0, litres: 0 },
        { percent: 0, litres: 5 },
      ],
    };
    expect(() => litresFromLevel(0, bad)).toThrow(CryoInputError);
  });
});

describe("litresFromMass", () => {
  it("uses the liquid density at NBP, 124.67 kg/m³ (cryogens-eos.json [eos])", () => {
    expect(HELIUM_LIQUID_DENSITY_KG_PER_L).toBeCloseTo(0.12467, 5);
    expect(litresFromMass(12.467)).toBeCloseTo(100, 2);
  });

  it("a density override (≈ 0.125 kg/L, common practice) is honoured", () => {
    expect(litresFromMass(25, 0.125)).toBeCloseTo(200, 12);
    expect(() => litresFromMass(-1)).toThrow(RangeError);
    expect(() => litresFromMass(1, 0)).toThrow(RangeError);
  });
});

describe("gasLitresFromLiquid", () => {
  it.each([
    ["15C_1atm", 736.8],
    ["20C_1atm", 749.6],
  ] as const)("1 L liquid → gas at %s 1 : %d (lib/cryo/README.md table [eos])", (ref, ratio) => {
    const gas = gasLitresFromLiquid(1, ref);
    expect(gas.gasLitres).toBeCloseTo(ratio, 1);
    expect(gas.reference).toBe(ref);
  });

  it("the ratio rises with the reference temperature; helium 1:745–757 is often quoted (common practice)", () => {
    const r = ["0C_1atm", "15C_1atm", "20C_1atm", "21.11C_1atm", "25C_1atm"] as const;
    const ratios = r.map((ref) => gasLitresFromLiquid(1, ref).expansionRatio);
    expect([...ratios].sort((a, b) => a - b)).toEqual(ratios);
    expect(gasLitresFromLiquid(1, "21.11C_1atm").expansionRatio).toBeGreaterThan(745);
    expect(gasLitresFromLiquid(1, "21.11C_1atm").expansionRatio).toBeLessThan(757);
  });

  it("nitrogen 1 : 692.0 at 20 °C (lib/cryo/README.md [eos])", () => {
    expect(gasLitresFromLiquid(10, "20C_1atm", "nitrogen").gasLitres).toBeCloseTo(6920, -1);
  });

  it("refuses an unknown reference condition", () => {
    expect(() => gasLitresFromLiquid(1, "STP" as never)).toThrow(/known: 0C_1atm/);
  });
});

/** Readings every 8 h on a straight line with a small, fixed ripple (meter noise). */
function history(ratePerDay: number, startLitres: number, n: number): LevelReading[] {
  return Array.from({ length: n }, (_, i) => ({
    timeMs: T0 + i * (DAY_MS / 3),
    litres: startLitres - (ratePerDay * i) / 3 + 0.2 * Math.sin(i * 1.7),
  }));
}

describe("boilOffRate", () => {
  const readings = history(5, 80, 12);
  const fit = boilOffRate(readings);

  it("slope agrees with simple-statistics linearRegression", () => {
    const days = readings.map((r) => [(r.timeMs - T0) / DAY_MS, r.litres]);
    const reference = ss.linearRegression(days);
    expect(fit.litresPerDay).toBeCloseTo(-reference.m, 10);
    expect(fit.litresPerDay).toBeGreaterThan(4.5);
    expect(fit.litresPerDay).toBeLessThan(5.5);
  });

  it("standard error agrees with s²(XᵀX)⁻¹ computed by mathjs", () => {
    const x = readings.map((r) => [1, (r.timeMs - T0) / DAY_MS]);
    const y = readings.map((r) => r.litres);
    const xtxInv = math.inv(math.multiply(math.transpose(x), x)) as number[][];
    const beta = math.multiply(xtxInv, math.multiply(math.transpose(x), y)) as number[];
    const residuals = y.map((v, i) => v - ((beta[0] ?? 0) + (beta[1] ?? 0) * (x[i]?.[1] ?? 0)));
    const s2 = residuals.reduce((s, r) => s + r * r, 0) / (y.length - 2);
    expect(fit.standardErrorLitresPerDay).toBeCloseTo(Math.sqrt(s2 * (xtxInv[1]?.[1] ?? NaN)), 10);
  });

  it("needs at least 3 readings", () => {
    expect(() => boilOffRate(readings.slice(0, 2))).toThrow(/at least 3 readings/);
  });

  it("refuses a history that contains a transfer (a rise), naming the reading", () => {
    const withTransfer = [...readings.slice(0, 4), { timeMs: T0 + 2 * DAY_MS, litres: 85 }, ...readings.slice(7)];
    expect(() => boilOffRate(withTransfer)).toThrow(/Reading 5 rises by .* a transfer lies inside/);
  });

  it("refuses readings out of time order", () => {
    expect(() => boilOffRate([readings[1]!, readings[0]!, readings[2]!])).toThrow(/not later/);
  });
});

describe("forecastMinimumLevel", () => {
  it("a clean line at 5 L/day from 80 L reaches 25 L after 11 days", () => {
    const clean = Array.from({ length: 5 }, (_, i) => ({
      timeMs: T0 + i * DAY_MS,
      litres: 80 - 5 * i + (i % 2) * 1e-9,
    }));
    const f = forecastMinimumLevel(boilOffRate(clean), 25, T0);
    expect(f.forecast).toBe(true);
    if (!f.forecast) return;
    expect(f.daysLeft).toBeCloseTo(11, 6);
    expect(f.reachDate.getTime()).toBeCloseTo(T0 + 11 * DAY_MS, -3);
  });

  it("the band widens with noise and brackets the central date", () => {
    const f = forecastMinimumLevel(boilOffRate(history(5, 80, 12)), 25, T0 + 4 * DAY_MS, { coverageFactor: 2 });
    if (!f.forecast) throw new Error("expected a forecast");
    expect(f.earliestMs).toBeLessThan(f.reachMs);
    expect(f.latestMs).not.toBeNull();
    expect(f.latestMs!).toBeGreaterThan(f.reachMs);
    expect(f.daysLeftEarliest).toBeLessThan(f.daysLeft);
  });

  it("no forecast when the level is not falling", () => {
    const flat = [0, 1, 2, 3].map((i) => ({ timeMs: T0 + i * DAY_MS, litres: 50 + 0.1 * i }));
    expect(forecastMinimumLevel(boilOffRate(flat), 25, T0).forecast).toBe(false);
  });
});

describe("transferEfficiency", () => {
  it("60 L gained from 90 L taken → 66.7 % (losses of 20–40 % are usual, common practice)", () => {
    const e = transferEfficiency(60, 90);
    expect(e.efficiency).toBeCloseTo(2 / 3, 12);
    expect(e.lossLitres).toBe(30);
    expect(e.exceedsSupply).toBe(false);
  });

  it("flags a gain above the taken volume and refuses taken ≤ 0", () => {
    expect(transferEfficiency(50, 40).exceedsSupply).toBe(true);
    expect(() => transferEfficiency(10, 0)).toThrow(/greater than 0/);
  });
});

describe("boilOffFromHeatLoad", () => {
  it("1 W → 1.40 L/h of liquid helium ([eos]); the older rule of thumb is 1.38 L/h (common practice)", () => {
    const { litresPerHour } = boilOffFromHeatLoad(1);
    expect(litresPerHour).toBeCloseTo(1.4, 2);
    expect(Math.abs(litresPerHour / 1.38 - 1)).toBeLessThan(0.02);
  });

  it("liquid nitrogen ≈ 0.0224 L/h per W ([eos])", () => {
    expect(boilOffFromHeatLoad(1, "nitrogen").litresPerHour).toBeCloseTo(0.0224, 4);
  });

  it("agrees with Q/(ρL) converted by mathjs units", () => {
    const perW = math.unit(1 / (124.6692678654977 * 20564.394565990526), "m^3/J");
    const lPerH = math.multiply(math.multiply(perW, math.unit(1, "W")), math.unit(1, "h")) as math.Unit;
    expect(boilOffFromHeatLoad(1).litresPerHour).toBeCloseTo(lPerH.toNumber("L"), 10);
  });
});

// The saturation table of cryogens-eos.json (CoolProp 8.0.0; helium after Ortiz-Vega et al., J. Phys.
// Chem. Ref. Data 2019; nitrogen after Span et al., J. Phys. Chem. Ref. Data 29 (2000)) [eos].
describe("saturatedLiquid: properties at the bath's pressure or temperature", () => {
  it("no bath given: the normal boiling point at 1 atm (124.67 kg/m³, 20.564 kJ/kg [eos])", () => {
    const l = saturatedLiquid("helium");
    expect(l.atNormalBoilingPoint).toBe(true);
    expect(l.pressurePa).toBe(101_325);
    expect(l.liquidDensityKgPerM3).toBeCloseTo(124.669, 3);
    expect(l.latentHeatJPerKg).toBeCloseTo(20_564.4, 1);
  });

  it("helium at 3.0 K / 24 061 Pa: 141.20 kg/m³, 23.506 kJ/kg (eos saturation table row [eos])", () => {
    for (const bath of [{ temperatureK: 3.0 }, { pressurePa: 24_061.385012 }]) {
      const l = saturatedLiquid("helium", bath);
      expect(l.atNormalBoilingPoint).toBe(false);
      expect(l.temperatureK).toBeCloseTo(3.0, 9);
      expect(l.pressurePa).toBeCloseTo(24_061.385, 3);
      expect(l.liquidDensityKgPerM3).toBeCloseTo(141.2004, 4);
      expect(l.latentHeatJPerKg).toBeCloseTo(23_506.32, 2);
    }
  });

  it("between rows the bath temperature agrees with ITS-90 (Metrologia 27, 3 (1990)) within 5 mK", () => {
    for (const pa of [15_000, 50_000, 150_000]) {
      expect(
        Math.abs(saturatedLiquid("helium", { pressurePa: pa }).temperatureK - he4TemperatureFromPressure(pa)),
      ).toBeLessThan(0.005);
    }
  });

  it("nitrogen at 70 K: 838.51 kg/m³, 208.07 kJ/kg (eos saturation table row [eos])", () => {
    const l = saturatedLiquid("nitrogen", { temperatureK: 70 });
    expect(l.liquidDensityKgPerM3).toBeCloseTo(838.515, 3);
    expect(l.latentHeatJPerKg).toBeCloseTo(208_068.67, 2);
  });

  it("outside the table it refuses and says the 1 atm figure does not hold there", () => {
    expect(() => saturatedLiquid("helium", { temperatureK: 1.5 })).toThrow(
      /below the equation-of-state saturation table's range for helium \(2\.2–5 K/,
    );
    expect(() => saturatedLiquid("helium", { pressurePa: 470 })).toThrow(/1 atm figures do not hold/);
    expect(() => saturatedLiquid("helium", { pressurePa: 3e5 })).toThrow(/above/);
  });
});

describe("boil-off and litres at the bath's condition", () => {
  it("1 W in a helium bath pumped to 3.0 K boils 1.0846 L/h, not the 1.40 L/h of 1 atm (eos row 3.0 K: 3600/(141.2004·23.50632) [calc])", () => {
    const b = boilOffFromHeatLoad(1, "helium", { temperatureK: 3.0 });
    expect(b.litresPerHour).toBeCloseTo(1.08463, 4);
    expect(b.liquid.temperatureK).toBeCloseTo(3.0, 9);
    expect(b.liquid.atNormalBoilingPoint).toBe(false);
  });

  it("a dewar pressurised to 130 056 Pa (4.5 K) boils 1.6340 L/h per W (eos row 4.5 K [calc])", () => {
    expect(boilOffFromHeatLoad(1, "helium", { pressurePa: 130_056.1468 }).litresPerHour).toBeCloseTo(1.634, 3);
  });

  it("without a bath the figure says it holds at 1 atm", () => {
    const b = boilOffFromHeatLoad(1);
    expect(b.liquid.atNormalBoilingPoint).toBe(true);
    expect(b.litresPerHour).toBeCloseTo(1.40419, 4); // 3600/(124.6693·20.5644) [calc, eos]
  });

  it("litres from mass: 14.120 kg of helium at 3.0 K is 100.0 L (141.2004 kg/m³ [eos]); at 1 atm 113.26 L", () => {
    const at3K = litresFromMassAt(14.120044468, { temperatureK: 3.0 });
    expect(at3K.litres).toBeCloseTo(100, 6);
    expect(at3K.liquid.atNormalBoilingPoint).toBe(false);
    const atNbp = litresFromMassAt(14.120044468);
    expect(atNbp.litres).toBeCloseTo(litresFromMass(14.120044468), 12);
    expect(atNbp.liquid.atNormalBoilingPoint).toBe(true);
    expect(atNbp.litres).toBeCloseTo(113.26, 2); // 14.12004/0.1246693 [calc, eos]
    expect(() => litresFromMassAt(-1)).toThrow(RangeError);
  });
});
