// IEC 60751 Callendar–Van Dusen against the standard's table values [pub] and lib/cryo/README.md [calc].
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { ptResistance, ptTemperature, ptToleranceC } from "@/lib/cryo";

describe("ptResistance (IEC 60751 table, Pt100)", () => {
  it.each([
    [-200, 18.52],
    [0, 100.0],
    [100, 138.51],
    [850, 390.48],
  ])("%d °C → %d Ω (IEC 60751 table [pub])", (t, r) => {
    expect(ptResistance(t)).toBeCloseTo(r, 2);
  });

  it("−196 °C (LN2) → 20.2465 Ω (lib/cryo/README.md [calc])", () => {
    expect(ptResistance(-196)).toBeCloseTo(20.2465, 4);
  });

  it("scales with R0 (Pt1000: 1385.055 Ω at 100 °C [calc], 1385.06 in the IEC 60751 table)", () => {
    expect(ptResistance(100, 1000)).toBeCloseTo(1385.055, 3);
  });

  it("refuses temperatures the standard does not define", () => {
    expect(() => ptResistance(-210)).toThrow(RangeError);
    expect(() => ptResistance(-210)).toThrow(/-200…850 °C/);
    expect(() => ptResistance(900)).toThrow(/above the IEC 60751 range/);
    expect(() => ptResistance(Number.NaN)).toThrow(/finite/);
    expect(() => ptResistance(0, 0)).toThrow(RangeError);
  });
});

describe("ptTemperature (inverse)", () => {
  it.each([
    [100.0, 0, 1e-9],
    [138.51, 100, 0.02],
    [390.48, 850, 0.02],
    [20.2465, -196, 0.001],
  ])("%d Ω → %d °C (IEC 60751 table / [calc])", (r, t, tol) => {
    expect(Math.abs(ptTemperature(r) - t)).toBeLessThan(tol);
  });

  it("refuses resistances outside −200…850 °C and names the range in Ω", () => {
    expect(() => ptTemperature(10)).toThrow(/18\.52–390\.48 Ω/);
    expect(() => ptTemperature(400)).toThrow(RangeError);
  });

  it("the lower edge named in the message is accepted: 18.52 Ω is −200 °C in the IEC 60751 table [pub]", () => {
    expect(ptTemperature(18.52)).toBeCloseTo(-200, 9);
    expect(ptTemperature(185.2, 1000)).toBeCloseTo(-200, 9); // Pt1000 table: 185.20 Ω at −200 °C [pub]
    expect(ptTemperature(ptResistance(-200))).toBeCloseTo(-200, 9); // the exact 18.520 08 Ω [calc]
    expect(() => ptTemperature(18.51)).toThrow(/below the IEC 60751 range \(-200…850 °C, 18\.52–390\.48 Ω/);
  });

  it("the upper edge likewise: 390.48 Ω (table) and the exact 390.481 Ω are 850 °C [pub, calc]", () => {
    expect(ptTemperature(390.48)).toBeCloseTo(850, 1);
    expect(ptTemperature(ptResistance(850))).toBeCloseTo(850, 9);
    expect(() => ptTemperature(390.49)).toThrow(/above the IEC 60751 range/);
  });

  it("ptTemperature(ptResistance(t)) ≈ t over the whole range (fast-check property)", () => {
    fc.assert(
      fc.property(fc.double({ min: -200, max: 850, noNaN: true }), fc.constantFrom(100, 500, 1000), (t, r0) => {
        expect(ptTemperature(ptResistance(t, r0), r0)).toBeCloseTo(t, 7);
      }),
    );
  });
});

describe("ptToleranceC (IEC 60751 classes [pub])", () => {
  it("class A ±(0.15 + 0.002|t|), class B ±(0.30 + 0.005|t|)", () => {
    expect(ptToleranceC(0, "A")).toBeCloseTo(0.15, 12);
    expect(ptToleranceC(100, "A")).toBeCloseTo(0.35, 12);
    expect(ptToleranceC(-196, "B")).toBeCloseTo(1.28, 12);
    expect(ptToleranceC(100, "B")).toBeCloseTo(0.8, 12);
    expect(() => ptToleranceC(-250, "B")).toThrow(RangeError);
  });
});
