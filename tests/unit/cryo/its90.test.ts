// ITS-90 helium vapour-pressure scale against Metrologia 27, 3 (1990) / Donnelly & Barenghi,
// J. Phys. Chem. Ref. Data 27, 1217 (1998), the [calc] values of lib/cryo/README.md, and the
// independent CoolProp equation of state in cryogens-eos.json.
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import {
  HE3_RANGE,
  HE4_RANGE,
  he3PressureFromTemperature,
  he3TemperatureFromPressure,
  he4PressureFromTemperature,
  he4TemperatureFromPressure,
} from "@/lib/cryo";
import eos from "@/lib/cryo/data/cryogens-eos.json";

describe("4He temperature from pressure", () => {
  it("normal boiling point 101 325 Pa → 4.2221 K (ITS-90 NBP, Metrologia 27 [pub])", () => {
    expect(he4TemperatureFromPressure(101_325)).toBeCloseTo(4.2221, 4);
    expect(he4TemperatureFromPressure(101_325)).toBeCloseTo(4.222099, 6); // [calc]
  });

  it.each([
    [100_000, 4.208137],
    [10_000, 2.488559],
  ])("%d Pa → %d K (lib/cryo/README.md [calc] from the published coefficients)", (p, t) => {
    expect(he4TemperatureFromPressure(p)).toBeCloseTo(t, 6);
  });

  it("both branches meet at the λ point 5041.8 Pa → 2.176799 K ([calc])", () => {
    expect(he4TemperatureFromPressure(5041.8)).toBeCloseTo(2.176799, 6);
    expect(he4TemperatureFromPressure(5041.81)).toBeCloseTo(2.176799, 5);
  });

  it("is monotonic across the whole range, including the branch change", () => {
    let previous = 0;
    for (let lnP = Math.log(HE4_RANGE.pressureMinPa); lnP <= Math.log(HE4_RANGE.pressureMaxPa); lnP += 0.002) {
      const t = he4TemperatureFromPressure(Math.exp(lnP));
      expect(t).toBeGreaterThan(previous);
      previous = t;
    }
  });

  it("refuses pressures outside the ITS-90 range, naming the range", () => {
    expect(() => he4TemperatureFromPressure(20)).toThrow(RangeError);
    expect(() => he4TemperatureFromPressure(20)).toThrow(/below the ITS-90 range \(1\.25–5\.0 K/);
    expect(() => he4TemperatureFromPressure(300_000)).toThrow(/above the ITS-90 range/);
    expect(() => he4TemperatureFromPressure(Number.NaN)).toThrow(RangeError);
    expect(() => he4TemperatureFromPressure(Number.POSITIVE_INFINITY)).toThrow(/finite/);
  });
});

describe("4He pressure from temperature (inverse)", () => {
  it.each([
    [1.5, 471.54, 0.01],
    [4.0, 81_616, 1],
  ])("%d K → %d Pa (lib/cryo/README.md [calc])", (t, p, tol) => {
    expect(Math.abs(he4PressureFromTemperature(t) - p)).toBeLessThan(tol);
  });

  it("range ends are 1.25 K and 5.0 K exactly", () => {
    expect(he4TemperatureFromPressure(he4PressureFromTemperature(1.25))).toBeCloseTo(1.25, 9);
    expect(he4TemperatureFromPressure(he4PressureFromTemperature(5.0))).toBeCloseTo(5.0, 9);
    expect(() => he4PressureFromTemperature(1.2)).toThrow(/below the ITS-90 range \(1\.25–5\.0 K/);
    expect(() => he4PressureFromTemperature(5.1)).toThrow(/above the ITS-90 range/);
  });

  it("agrees with the CoolProp saturation table within ±0.3 % in p (cryogens-eos.json [eos])", () => {
    for (const row of eos.fluids.Helium.saturation) {
      const p = he4PressureFromTemperature(row.T_K);
      expect(Math.abs(p / row.p_sat_Pa - 1)).toBeLessThan(0.003);
    }
  });

  it("round-trips T → p → T (fast-check property)", () => {
    fc.assert(
      fc.property(fc.double({ min: 1.25, max: 5.0, noNaN: true }), (t) => {
        expect(he4TemperatureFromPressure(he4PressureFromTemperature(t))).toBeCloseTo(t, 7);
      }),
    );
  });
});

describe("3He (coefficients from memory, checked against lib/cryo/README.md [calc] values)", () => {
  it.each([
    [1.0, 1160.1, 0.1],
    [2.0, 19_999, 1],
  ])("%d K → %d Pa", (t, p, tol) => {
    expect(Math.abs(he3PressureFromTemperature(t) - p)).toBeLessThan(tol);
  });

  it("forward and inverse agree; range 0.65–3.2 K enforced", () => {
    expect(he3TemperatureFromPressure(1160.1)).toBeCloseTo(1.0, 4);
    expect(he3TemperatureFromPressure(HE3_RANGE.pressureMinPa)).toBeCloseTo(0.65, 9);
    expect(() => he3TemperatureFromPressure(100)).toThrow(/below the ITS-90 range \(0\.65–3\.2 K/);
    expect(() => he3PressureFromTemperature(3.3)).toThrow(/above the ITS-90 range \(0\.65–3\.2 K/);
  });

  it("round-trips p → T → p (fast-check property)", () => {
    fc.assert(
      fc.property(
        fc.double({ min: Math.log(HE3_RANGE.pressureMinPa), max: Math.log(HE3_RANGE.pressureMaxPa), noNaN: true }),
        (lnP) => {
          const p = Math.exp(lnP);
          expect(he3PressureFromTemperature(he3TemperatureFromPressure(p)) / p).toBeCloseTo(1, 9);
        },
      ),
    );
  });

  it("3He boils lower than 4He at the same pressure (physics sanity)", () => {
    expect(he3TemperatureFromPressure(10_000)).toBeLessThan(he4TemperatureFromPressure(10_000));
  });
});
