// Oxygen-deficiency estimates against the FESHM 4240-style forms of lib/cryo/README.md ([calc] check
// values; the manual's own text from memory) and the OSHA 29 CFR 1910.146 thresholds [pub].
import { describe, expect, it } from "vitest";
import {
  classifyOxygen,
  gasLitresFromLiquid,
  oxygenAfterDisplacement,
  oxygenAfterMixedRelease,
  oxygenDuringRelease,
  quenchGasVolume,
  steadyStateOxygen,
  timeToOxygenFraction,
  ventilationFromAirChanges,
} from "@/lib/cryo";

const PER_MIN = 1 / 60;

describe("continuous release", () => {
  it("V = 100 m³, R = 1 m³/min, Q = 0: C(10 min) = 0.190016 (lib/cryo/README.md [calc])", () => {
    const c = oxygenDuringRelease({ roomVolumeM3: 100, releaseM3PerS: PER_MIN, ventilationM3PerS: 0 }, 600);
    expect(c).toBeCloseTo(0.190016, 6);
    expect(c).toBeCloseTo(0.21 * Math.exp(-0.1), 12); // the no-ventilation form 0.21·e^{−Rt/V}
  });

  it("Q = 5 m³/min supply: C(60 min) = 0.175956 (lib/cryo/README.md [calc])", () => {
    const c = oxygenDuringRelease({ roomVolumeM3: 100, releaseM3PerS: PER_MIN, ventilationM3PerS: 5 * PER_MIN }, 3600);
    expect(c).toBeCloseTo(0.175956, 6);
  });

  it("time to 19.5 % inverts C(t); with enough ventilation it is never reached", () => {
    const room = { roomVolumeM3: 100, releaseM3PerS: PER_MIN, ventilationM3PerS: 5 * PER_MIN };
    const t = timeToOxygenFraction(room, 0.195);
    if (!t.reached) throw new Error("expected the level to be reached");
    expect(oxygenDuringRelease(room, t.timeS)).toBeCloseTo(0.195, 12);
    const windy = { ...room, ventilationM3PerS: 50 * PER_MIN };
    expect(timeToOxygenFraction(windy, 0.195)).toEqual({
      reached: false,
      steadyStateFraction: steadyStateOxygen(windy),
    });
    expect(steadyStateOxygen(windy)).toBeCloseTo((0.21 * 50) / 51, 12);
  });

  it("refuses a target above fresh air and negative rates", () => {
    const room = { roomVolumeM3: 100, releaseM3PerS: PER_MIN, ventilationM3PerS: 0 };
    expect(() => timeToOxygenFraction(room, 0.25)).toThrow(/above the range 0–0\.21/);
    expect(() => oxygenDuringRelease({ ...room, releaseM3PerS: -1 }, 10)).toThrow(RangeError);
  });

  it("4 air changes per hour in the 220 m³ demo room = 0.2444 m³/s", () => {
    expect(ventilationFromAirChanges(220, 4)).toBeCloseTo(880 / 3600, 12);
  });
});

describe("sudden release", () => {
  it("mixed: 0.21·V/(V+Vgas); displacement worst case: 0.21·(1 − Vgas/V), floored at 0", () => {
    const release = { roomVolumeM3: 220, gasVolumeM3: 67.5 };
    expect(oxygenAfterMixedRelease(release)).toBeCloseTo((0.21 * 220) / 287.5, 12);
    expect(oxygenAfterDisplacement(release)).toBeCloseTo(0.21 * (1 - 67.5 / 220), 12);
    expect(oxygenAfterDisplacement(release)).toBeLessThan(oxygenAfterMixedRelease(release));
    expect(oxygenAfterDisplacement({ roomVolumeM3: 50, gasVolumeM3: 60 })).toBe(0);
  });

  it("quench of 90 L liquid → 67.5 m³ at 20 °C/1 atm (eos ratio 749.6); reference is carried", () => {
    const gas = quenchGasVolume(90);
    expect(gas.gasM3).toBeCloseTo(67.465, 3);
    expect(gas.reference).toBe("20C_1atm");
    expect(quenchGasVolume(90, "0C_1atm").gasM3).toBeCloseTo(gasLitresFromLiquid(90, "0C_1atm").gasLitres / 1000, 12);
  });
});

describe("classifyOxygen", () => {
  it("defaults: alarm 19.5 % (OSHA 29 CFR 1910.146 [pub]), evacuate 18 % (common practice)", () => {
    expect(classifyOxygen(0.209).status).toBe("normal");
    expect(classifyOxygen(0.19).status).toBe("alarm");
    expect(classifyOxygen(0.19).deficient).toBe(true);
    expect(classifyOxygen(0.175).status).toBe("evacuate");
    expect(classifyOxygen(0.24).status).toBe("enriched"); // > 23.5 % enriched, 1910.146 (from memory)
  });

  it("the facility's own thresholds win", () => {
    expect(classifyOxygen(0.19, { alarm: 0.2, evacuate: 0.19 }).status).toBe("evacuate");
    expect(() => classifyOxygen(0.19, { alarm: 0.17 })).toThrow(/evacuate ≤ alarm/);
  });

  it("refuses percentages passed as fractions", () => {
    expect(() => classifyOxygen(20.9)).toThrow(/above the range 0–1 \(a fraction, not %\)/);
  });
});
