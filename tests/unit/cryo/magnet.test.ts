// Magnet arithmetic against lib/cryo/README.md [calc] values (½LI², quench bound with the eos density and
// latent heat, dipole contour distances) and mathjs (μ0 and unit conversions).
import * as math from "mathjs";
import { describe, expect, it } from "vitest";
import {
  contourDistance,
  currentFromField,
  dipoleMomentFromField,
  fieldFromCurrent,
  type MagnetSpec,
  quenchBoilOffLitresMax,
  rampTime,
  storedEnergyJ,
  VACUUM_PERMEABILITY_N_PER_A2,
} from "@/lib/cryo";

// The invented "Plover" magnet of the demo scenario.
const PLOVER: MagnetSpec = { coilConstantTPerA: 0.12, maxCurrentA: 120, inductanceH: 60, rampLimitTPerMin: 0.2 };

describe("field ↔ current", () => {
  it("0.12 T/A × 100 A = 12 T and back", () => {
    expect(fieldFromCurrent(100, PLOVER)).toBeCloseTo(12, 12);
    expect(currentFromField(12, PLOVER)).toBeCloseTo(100, 12);
    expect(fieldFromCurrent(-50, PLOVER)).toBeCloseTo(-6, 12);
  });

  it("refuses currents above the magnet's rating, naming it", () => {
    expect(() => fieldFromCurrent(121, PLOVER)).toThrow(/above the magnet's rating \(±120 A\)/);
    expect(() => currentFromField(15, PLOVER)).toThrow(RangeError);
    expect(() => currentFromField(Number.NaN, PLOVER)).toThrow(/finite/);
  });
});

describe("rampTime", () => {
  it("0 → 9 T at 0.15 T/min takes 60 min", () => {
    const t = rampTime(0, 9, 0.15);
    expect(t.minutes).toBeCloseTo(60, 12);
    expect(t.seconds).toBeCloseTo(3600, 9);
  });

  it("refuses a rate above the magnet's limit and a target above its field", () => {
    expect(() => rampTime(0, 5, 0.3, PLOVER)).toThrow(/above the magnet's ramp limit \(0\.2 T\/min\)/);
    expect(() => rampTime(0, 15, 0.1, PLOVER)).toThrow(/magnet's rating/);
    expect(() => rampTime(0, 5, 0)).toThrow(RangeError);
    expect(rampTime(12, 2, 0.2, PLOVER).minutes).toBeCloseTo(50, 12);
  });
});

describe("stored energy and quench", () => {
  it("10 H at 100 A → 50.0 kJ (lib/cryo/README.md); mathjs agrees on H·A² = J", () => {
    expect(storedEnergyJ(10, 100)).toBeCloseTo(50_000, 9);
    const e = math.multiply(0.5, math.multiply(math.unit(10, "H"), math.pow(math.unit(100, "A"), 2))) as math.Unit;
    expect(e.toNumber("J")).toBeCloseTo(storedEnergyJ(10, 100), 6);
  });

  it("50 kJ boils at most 19.5 L of liquid helium, E/2.564 kJ per litre (lib/cryo/README.md [calc, eos])", () => {
    expect(quenchBoilOffLitresMax(50_000)).toBeCloseTo(19.5, 1);
    expect(50_000 / quenchBoilOffLitresMax(50_000)).toBeCloseTo(2564, 0);
  });
});

describe("contour distance (dipole far field, estimate)", () => {
  it("μ0 matches mathjs magneticConstant (CODATA 2018)", () => {
    expect(math.magneticConstant.toNumber("N / A^2")).toBeCloseTo(VACUUM_PERMEABILITY_N_PER_A2, 17);
  });

  it("m = 2.5e4 A·m²: 5.000 mT at 1 m on axis; 0.5 mT at 2.154 m on axis, 1.710 m on the equator ([calc])", () => {
    expect(dipoleMomentFromField(5e-3, 1, "axis")).toBeCloseTo(2.5e4, 0);
    const c = contourDistance({ dipoleMomentAm2: 2.5e4 });
    expect(c.estimate).toBe(true);
    expect(c.contourT).toBe(0.5e-3);
    expect(c.axisDistanceM).toBeCloseTo(2.154, 3);
    expect(c.equatorDistanceM).toBeCloseTo(1.71, 3);
  });

  it("derives m from a field measured at a known distance; 0.9 mT contour lies closer", () => {
    const fromField = contourDistance({ fieldT: 5e-3, distanceM: 1, direction: "axis" });
    expect(fromField.axisDistanceM).toBeCloseTo(2.154, 3);
    const equatorial = contourDistance({ fieldT: 2.5e-3, distanceM: 1, direction: "equator" });
    expect(equatorial.dipoleMomentAm2).toBeCloseTo(2.5e4, 0);
    expect(contourDistance({ dipoleMomentAm2: 2.5e4 }, 0.9e-3).axisDistanceM).toBeLessThan(2.154);
  });

  it("refuses non-positive inputs", () => {
    expect(() => contourDistance({ dipoleMomentAm2: 0 })).toThrow(RangeError);
    expect(() => contourDistance({ dipoleMomentAm2: 1 }, -1)).toThrow(RangeError);
  });
});
