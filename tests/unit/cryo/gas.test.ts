// Gas accounting against CODATA 2018 molar volumes [pub], the lib/cryo/README.md [calc] example, mathjs
// (gasConstant, molarVolume and unit conversions) and the CoolProp Z table (cryogens-eos.json).
import Decimal from "decimal.js";
import * as math from "mathjs";
import { describe, expect, it } from "vitest";
import {
  absolutePressurePa,
  GAS_CONSTANT_J_PER_MOL_K,
  gasAmount,
  heliumCompressibility20C,
  MOLAR_VOLUME_L_PER_MOL,
  mixtureLoss,
  STANDARD_ATMOSPHERE_PA,
} from "@/lib/cryo";

describe("molar volumes and R", () => {
  it("R = N_A·k_B = 8.314 462 618 J/(mol·K) exactly (2019 SI), computed in decimal.js", () => {
    const exact = new Decimal("6.02214076e23").times("1.380649e-23");
    expect(exact.toString()).toBe("8.31446261815324");
    expect(GAS_CONSTANT_J_PER_MOL_K).toBeCloseTo(exact.toNumber(), 14);
    expect(math.gasConstant.toNumber("J / (K mol)")).toBeCloseTo(GAS_CONSTANT_J_PER_MOL_K, 12);
  });

  it("22.413 969 54 L/mol at 0 °C/1 atm and 22.710 954 64 L/mol at 0 °C/100 kPa (CODATA 2018)", () => {
    expect(MOLAR_VOLUME_L_PER_MOL["0C_1atm"]).toBeCloseTo(22.41396954, 8);
    // mathjs gives RT/p unrounded (22.413 969 545…); CODATA prints 10 significant digits
    expect(math.molarVolume.toNumber("L/mol")).toBeCloseTo(MOLAR_VOLUME_L_PER_MOL["0C_1atm"], 7);
    expect(MOLAR_VOLUME_L_PER_MOL["0C_100kPa"]).toBeCloseTo((GAS_CONSTANT_J_PER_MOL_K * 273.15) / 100, 7);
  });

  it("15 °C and 20 °C at 1 atm by the ideal gas law (cross-checked with mathjs units)", () => {
    const v20 = math.divide(math.multiply(math.gasConstant, math.unit(293.15, "K")), math.unit(1, "atm")) as math.Unit;
    expect(MOLAR_VOLUME_L_PER_MOL["20C_1atm"]).toBeCloseTo(v20.toNumber("L/mol"), 9);
    const v15 = new Decimal("8.31446261815324").times("288.15").div("101325").times(1000);
    expect(MOLAR_VOLUME_L_PER_MOL["15C_1atm"]).toBeCloseTo(v15.toNumber(), 10); // decimal.js: 23.64483…
  });
});

describe("gasAmount", () => {
  it("10 L at 1.000 bar, 295.0 K → 0.407703 mol → 9.1382 L at 0 °C/1 atm (lib/cryo/README.md [calc])", () => {
    const a = gasAmount({ pressurePa: 1e5, volumeLitres: 10, temperatureK: 295 });
    expect(a.mol).toBeCloseTo(0.407703, 6);
    expect(a.litresAtReference).toBeCloseTo(9.1382, 4);
    expect(a.reference).toBe("0C_1atm");
    expect(a.idealGasWarning).toBe(false);
  });

  it("warns above a few bar when Z is not given: helium Z = 1.0952 at 200 bar, 20 °C ([eos])", () => {
    const cylinder = { pressurePa: 200e5, volumeLitres: 50, temperatureK: 293.15 };
    const ideal = gasAmount(cylinder);
    expect(ideal.idealGasWarning).toBe(true);
    const z = heliumCompressibility20C(200e5);
    expect(z).toBeCloseTo(1.0952, 4);
    const real = gasAmount({ ...cylinder, compressibilityZ: z });
    expect(real.idealGasWarning).toBe(false);
    expect(ideal.mol / real.mol - 1).toBeCloseTo(0.0952, 3); // ideal overstates by ≈ 9.5 %
  });

  it("Z table interpolation stays between rows and refuses outside 1–300 bar", () => {
    const z = heliumCompressibility20C(125e5);
    expect(z).toBeGreaterThan(1.0481);
    expect(z).toBeLessThan(1.0718);
    expect(() => heliumCompressibility20C(400e5)).toThrow(/above the helium Z table's range \(1–300 bar/);
  });

  it("refuses non-physical tanks and unknown references", () => {
    expect(() => gasAmount({ pressurePa: 0, volumeLitres: 10, temperatureK: 295 })).toThrow(RangeError);
    expect(() => gasAmount({ pressurePa: 1e5, volumeLitres: 10, temperatureK: Number.NaN })).toThrow(/finite/);
    expect(() => gasAmount({ pressurePa: 1e5, volumeLitres: 10, temperatureK: 295 }, "NTP" as never)).toThrow(
      /Unknown reference/,
    );
  });
});

describe("mixtureLoss", () => {
  it("40 L tank: 0.850 bar at 295 K before, 0.842 bar at 293 K after → small loss in litres and %", () => {
    const loss = mixtureLoss(40, { pressurePa: 85_000, temperatureK: 295 }, { pressurePa: 84_200, temperatureK: 293 });
    const before = (85_000 * 0.04 * 22.41396954) / (GAS_CONSTANT_J_PER_MOL_K * 295);
    const after = (84_200 * 0.04 * 22.41396954) / (GAS_CONSTANT_J_PER_MOL_K * 293);
    expect(loss.litresLost).toBeCloseTo(before - after, 9);
    expect(loss.percentLost).toBeCloseTo((100 * (before - after)) / before, 9);
    expect(loss.percentLost).toBeGreaterThan(0);
    expect(loss.percentLost).toBeLessThan(1);
    expect(loss.reference).toBe("0C_1atm");
  });

  it("a pressure rise shows as a negative loss (air leaking in)", () => {
    const loss = mixtureLoss(40, { pressurePa: 80_000, temperatureK: 295 }, { pressurePa: 82_000, temperatureK: 295 });
    expect(loss.litresLost).toBeLessThan(0);
  });
});

describe("absolutePressurePa (gauge readings)", () => {
  it("gauge + barometric; the default barometric is the standard atmosphere, 1013.25 hPa (exact by definition [pub])", () => {
    expect(STANDARD_ATMOSPHERE_PA).toBe(101_325);
    expect(absolutePressurePa(200e5, "gauge")).toBe(200e5 + 101_325); // 201.013 25 bar absolute [calc]
    expect(absolutePressurePa(0, "gauge", 95_000)).toBe(95_000);
    expect(absolutePressurePa(-20_000, "gauge", 95_000)).toBe(75_000); // a compound gauge below atmosphere
    expect(absolutePressurePa(81_200, "absolute")).toBe(81_200); // an absolute reading is used as read
    expect(absolutePressurePa(81_200, "absolute", 95_000)).toBe(81_200);
  });

  it("10 L at 0 bar gauge under 1000 hPa is the 1.000 bar example: 0.407703 mol at 295.0 K (lib/cryo/README.md [calc])", () => {
    const a = gasAmount({ pressurePa: absolutePressurePa(0, "gauge", 100_000), volumeLitres: 10, temperatureK: 295 });
    expect(a.mol).toBeCloseTo(0.407703, 6);
  });

  it("a 200 bar gauge reading is 0.5 % more gas than the same number taken as absolute ([calc])", () => {
    const cyl = { volumeLitres: 50, temperatureK: 293.15 };
    const asGauge = gasAmount({ ...cyl, pressurePa: absolutePressurePa(200e5, "gauge") });
    const asAbsolute = gasAmount({ ...cyl, pressurePa: absolutePressurePa(200e5, "absolute") });
    expect(asGauge.mol / asAbsolute.mol).toBeCloseTo(1 + 101_325 / 200e5, 12);
  });

  it("refuses a reading below vacuum, an implausible barometric pressure and an unknown kind", () => {
    expect(() => absolutePressurePa(-120_000, "gauge")).toThrow(/below vacuum/);
    expect(() => absolutePressurePa(-1, "absolute")).toThrow(RangeError);
    expect(() => absolutePressurePa(1e5, "gauge", 1013.25)).toThrow(
      /Barometric pressure 10\.13 hPa is below the plausible room barometric pressure \(500–1100 hPa\)/,
    );
    expect(() => absolutePressurePa(1e5, "psig" as never)).toThrow(/gauge or absolute/);
    expect(() => absolutePressurePa(Number.NaN, "gauge")).toThrow(/finite/);
  });
});
