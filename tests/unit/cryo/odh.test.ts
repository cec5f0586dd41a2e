// Oxygen-deficiency estimates against the well-mixed room balance (the standard mass balance of a
// ventilated room, V·dC/dt = C_air·F_fresh − C·F_out, solved in closed form and checked here with a
// numerical integration), the FESHM 4240-style forms of lib/cryo/README.md ([calc] check values;
// the manual's own text from memory), the Oxford University Safety Office worked example [pub] and
// the OSHA 29 CFR 1910.146 definition "oxygen deficient: below 19.5 %" [pub]. Fresh air is 20.9 %
// O2 (what an oxygen monitor reads in fresh air; dry air 20.95 % [memory]).
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import {
  AIR_OXYGEN_FRACTION,
  type ContinuousRelease,
  classifyOxygen,
  continuousReleaseOxygen,
  freshAirInflowM3PerS,
  gasLitresFromLiquid,
  OSHA_DEFICIENT_FRACTION,
  OXYGEN_MODEL_LABEL,
  oxygenAfterDisplacement,
  oxygenAfterMixedRelease,
  oxygenDuringRelease,
  quenchGasVolume,
  steadyStateOxygen,
  suddenReleaseOxygen,
  timeToOxygenFraction,
  ventilationFromAirChanges,
} from "@/lib/cryo";

const PER_MIN = 1 / 60;

/** RK4 integration of the well-mixed room balance, independent of the closed form. */
function integrateRoom(v: number, fresh: number, release: number, timeS: number, steps = 20_000): number {
  const out = fresh + release; // what comes in leaves: the room keeps its volume
  const f = (c: number) => (AIR_OXYGEN_FRACTION * fresh - c * out) / v;
  let c = AIR_OXYGEN_FRACTION;
  const h = timeS / steps;
  for (let i = 0; i < steps; i++) {
    const k1 = f(c);
    const k2 = f(c + (h * k1) / 2);
    const k3 = f(c + (h * k2) / 2);
    const k4 = f(c + h * k3);
    c += (h * (k1 + 2 * k2 + 2 * k3 + k4)) / 6;
  }
  return c;
}

describe("fresh air", () => {
  it("is 20.9 % O2, as oxygen monitors read fresh air (dry air 20.95 % [memory])", () => {
    expect(AIR_OXYGEN_FRACTION).toBe(0.209);
  });
});

describe("continuous release, supply ventilation", () => {
  it("V = 100 m³, R = 1 m³/min, Q = 0: C(10 min) = 0.209·e^−0.1 = 0.189111 (lib/cryo/README.md [calc])", () => {
    const c = oxygenDuringRelease({ roomVolumeM3: 100, releaseM3PerS: PER_MIN, ventilationM3PerS: 0 }, 600);
    expect(c).toBeCloseTo(0.189111, 6);
    expect(c).toBeCloseTo(0.209 * Math.exp(-0.1), 12); // the no-ventilation form C_air·e^{−Rt/V}
  });

  it("Q = 5 m³/min supply: C(60 min) = 0.209·(5 + e^−3.6)/6 = 0.175118 (lib/cryo/README.md [calc])", () => {
    const c = oxygenDuringRelease({ roomVolumeM3: 100, releaseM3PerS: PER_MIN, ventilationM3PerS: 5 * PER_MIN }, 3600);
    expect(c).toBeCloseTo(0.175118, 6);
  });

  it("the closed form solves the well-mixed room balance (RK4 integration of the ODE)", () => {
    const room = { roomVolumeM3: 100, releaseM3PerS: PER_MIN, ventilationM3PerS: 5 * PER_MIN };
    expect(oxygenDuringRelease(room, 3600)).toBeCloseTo(integrateRoom(100, 5 * PER_MIN, PER_MIN, 3600), 9);
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
    expect(steadyStateOxygen(windy)).toBeCloseTo((0.209 * 50) / 51, 12);
  });

  it("refuses a target above fresh air and negative rates", () => {
    const room = { roomVolumeM3: 100, releaseM3PerS: PER_MIN, ventilationM3PerS: 0 };
    expect(() => timeToOxygenFraction(room, 0.25)).toThrow(/above the range 0–0\.209/);
    expect(() => oxygenDuringRelease({ ...room, releaseM3PerS: -1 }, 10)).toThrow(RangeError);
  });

  it("4 air changes per hour in the 220 m³ demo room = 0.2444 m³/s", () => {
    expect(ventilationFromAirChanges(220, 4)).toBeCloseTo(880 / 3600, 12);
  });

  it("Oxford Safety Office policy S4/03 App. 1 [pub]: 36 m³, 0.4 air changes/h, 5 dewars × 0.15 L/day × 2 × 700", () => {
    const gasM3PerH = (5 * 0.15 * 2 * 700) / 1000 / 24; // the policy's ≈ 0.044 m³/h
    expect(gasM3PerH).toBeCloseTo(0.044, 3);
    const room = {
      roomVolumeM3: 36,
      releaseM3PerS: gasM3PerH / 3600,
      ventilationM3PerS: ventilationFromAirChanges(36, 0.4),
    };
    // settles at 0.209·14.4/(14.4 + 0.04375) = 0.208367 [calc]: no deficiency in that room
    expect(steadyStateOxygen(room)).toBeCloseTo(0.208367, 6);
    expect(classifyOxygen(steadyStateOxygen(room)).status).toBe("normal");
  });
});

describe("continuous release, exhaust ventilation", () => {
  const exhaust: ContinuousRelease = {
    roomVolumeM3: 100,
    releaseM3PerS: PER_MIN,
    ventilationM3PerS: 5 * PER_MIN,
    ventilationKind: "exhaust",
  };

  it("fresh air drawn in is the extract minus the release: Q − R, never below 0 (room volume balance)", () => {
    expect(freshAirInflowM3PerS(exhaust)).toBeCloseTo(4 * PER_MIN, 15);
    expect(freshAirInflowM3PerS({ ...exhaust, ventilationKind: "supply" })).toBeCloseTo(5 * PER_MIN, 15);
    expect(freshAirInflowM3PerS({ ...exhaust, ventilationM3PerS: 0.5 * PER_MIN })).toBe(0);
  });

  it("Q = 5 m³/min extract, R = 1 m³/min: C(60 min) = 0.209·[(1 − R/Q) + (R/Q)e^{−Qt/V}] = 0.169281 (FESHM 4240 exhaust form [memory]; [calc])", () => {
    const c = oxygenDuringRelease(exhaust, 3600);
    expect(c).toBeCloseTo(0.169281, 6);
    expect(c).toBeCloseTo(0.209 * (1 - 1 / 5 + (1 / 5) * Math.exp(-3)), 12);
    expect(steadyStateOxygen(exhaust)).toBeCloseTo(0.209 * (1 - 1 / 5), 12);
  });

  it("is the same balance with fresh air Q − R: matches the RK4 integration, and is below supply of the same Q", () => {
    expect(oxygenDuringRelease(exhaust, 3600)).toBeCloseTo(integrateRoom(100, 4 * PER_MIN, PER_MIN, 3600), 9);
    expect(oxygenDuringRelease(exhaust, 3600)).toBeLessThan(
      oxygenDuringRelease({ ...exhaust, ventilationKind: "supply" }, 3600),
    );
  });

  it("an extract smaller than the release draws no fresh air: as an unventilated room", () => {
    const weak = { ...exhaust, ventilationM3PerS: 0.5 * PER_MIN };
    expect(oxygenDuringRelease(weak, 600)).toBeCloseTo(0.209 * Math.exp(-0.1), 12);
    expect(steadyStateOxygen(weak)).toBe(0);
  });

  it("the result names its model", () => {
    const r = continuousReleaseOxygen(exhaust, 3600);
    expect(r.model).toBe("well-mixed-exhaust");
    expect(r.label).toBe(OXYGEN_MODEL_LABEL["well-mixed-exhaust"]);
    expect(r.fraction).toBe(oxygenDuringRelease(exhaust, 3600));
    expect(continuousReleaseOxygen({ ...exhaust, ventilationKind: undefined }, 60).model).toBe("well-mixed-supply");
  });
});

describe("sudden release", () => {
  const release = { roomVolumeM3: 220, gasVolumeM3: 67.5 };

  it("mixed, mixed air leaving as gas enters: 0.209·e^{−Vgas/V}; 30 m³ into 220 m³ → 18.24 % ([calc])", () => {
    expect(oxygenAfterMixedRelease({ roomVolumeM3: 220, gasVolumeM3: 30 })).toBeCloseTo(0.182358, 6);
    expect(oxygenAfterMixedRelease(release)).toBeCloseTo(0.209 * Math.exp(-67.5 / 220), 12);
    // not the least conservative V/(V + Vgas) form
    expect(oxygenAfterMixedRelease(release)).toBeLessThan((0.209 * 220) / 287.5);
  });

  it("displacement (worst case): 0.209·(V − Vgas)/V, floored at 0; 30 m³ into 220 m³ → 18.05 % ([calc])", () => {
    expect(oxygenAfterDisplacement({ roomVolumeM3: 220, gasVolumeM3: 30 })).toBeCloseTo(0.1805, 12);
    expect(oxygenAfterDisplacement(release)).toBeCloseTo(0.209 * (1 - 67.5 / 220), 12);
    expect(oxygenAfterDisplacement(release)).toBeLessThan(oxygenAfterMixedRelease(release));
    expect(oxygenAfterDisplacement({ roomVolumeM3: 50, gasVolumeM3: 60 })).toBe(0);
  });

  it("each figure names its model; the conservative one is the lowest (displacement, as 1 − x ≤ e^−x)", () => {
    const s = suddenReleaseOxygen(release);
    expect(s.estimates.map((e) => e.model)).toEqual(["displacement", "mixed-outflow"]);
    for (const e of s.estimates) expect(e.label).toBe(OXYGEN_MODEL_LABEL[e.model]);
    expect(s.conservative.model).toBe("displacement");
    expect(s.conservative.fraction).toBe(oxygenAfterDisplacement(release));
    fc.assert(
      fc.property(
        fc.double({ min: 1, max: 1e4, noNaN: true }),
        fc.double({ min: 0, max: 2e4, noNaN: true }),
        (v, g) => {
          const r = { roomVolumeM3: v, gasVolumeM3: g };
          expect(oxygenAfterDisplacement(r)).toBeLessThanOrEqual(oxygenAfterMixedRelease(r) + 1e-15);
        },
      ),
    );
  });

  it("agrees with the continuous model: no ventilation, R·t = Vgas gives the same figure", () => {
    fc.assert(
      fc.property(
        fc.double({ min: 1, max: 1e4, noNaN: true }),
        fc.double({ min: 0, max: 1e4, noNaN: true }),
        fc.double({ min: 1e-3, max: 10, noNaN: true }),
        (v, g, r) => {
          const c = oxygenDuringRelease({ roomVolumeM3: v, releaseM3PerS: r, ventilationM3PerS: 0 }, g / r);
          expect(c).toBeCloseTo(oxygenAfterMixedRelease({ roomVolumeM3: v, gasVolumeM3: g }), 12);
        },
      ),
    );
  });

  it("agrees with the continuous model in the limit of a fast release, ventilation or not", () => {
    const gas = 30;
    const sudden = oxygenAfterMixedRelease({ roomVolumeM3: 220, gasVolumeM3: gas });
    const gap = (kind: "supply" | "exhaust", releaseS: number) =>
      Math.abs(
        oxygenDuringRelease(
          { roomVolumeM3: 220, releaseM3PerS: gas / releaseS, ventilationM3PerS: 0.2444, ventilationKind: kind },
          releaseS,
        ) - sudden,
      );
    // supply: the fresh air blown in during the release matters less the faster it is
    expect(gap("supply", 1)).toBeLessThan(gap("supply", 60));
    expect(gap("supply", 0.01)).toBeLessThan(gap("supply", 1));
    expect(gap("supply", 0.01)).toBeLessThan(1e-5);
    // exhaust: a release faster than the extract draws no fresh air, so the figures coincide
    for (const releaseS of [60, 1, 0.01]) expect(gap("exhaust", releaseS)).toBeLessThan(1e-12);
  });

  it("quench of 90 L liquid → 67.5 m³ at 20 °C/1 atm (eos ratio 749.6); reference is carried", () => {
    const gas = quenchGasVolume(90);
    expect(gas.gasM3).toBeCloseTo(67.465, 3);
    expect(gas.reference).toBe("20C_1atm");
    expect(quenchGasVolume(90, "0C_1atm").gasM3).toBeCloseTo(gasLitresFromLiquid(90, "0C_1atm").gasLitres / 1000, 12);
  });
});

describe("classifyOxygen", () => {
  it("defaults: alarm below 19.5 % (OSHA 29 CFR 1910.146 [pub]), evacuate below 18 % (common practice)", () => {
    expect(classifyOxygen(0.209).status).toBe("normal");
    expect(classifyOxygen(0.19).status).toBe("alarm");
    expect(classifyOxygen(0.19).deficient).toBe(true);
    expect(classifyOxygen(0.175).status).toBe("evacuate");
    expect(classifyOxygen(0.24).status).toBe("enriched"); // > 23.5 % enriched, 1910.146 (from memory)
  });

  it("exactly 19.5 % is neither deficient nor an alarm: OSHA's 'below 19.5 %' [pub], one rule for both", () => {
    expect(OSHA_DEFICIENT_FRACTION).toBe(0.195);
    const at = classifyOxygen(0.195);
    expect(at.deficient).toBe(false);
    expect(at.status).toBe("normal");
    const below = classifyOxygen(0.1949);
    expect(below.deficient).toBe(true);
    expect(below.status).toBe("alarm");
    expect(classifyOxygen(0.18).status).toBe("alarm"); // 18 % exactly: not yet below the evacuate point
    expect(classifyOxygen(0.1799).status).toBe("evacuate");
  });

  it("the facility's own thresholds win, with the same 'below the point' rule", () => {
    expect(classifyOxygen(0.185, { alarm: 0.2, evacuate: 0.19 }).status).toBe("evacuate");
    expect(classifyOxygen(0.19, { alarm: 0.2, evacuate: 0.19 }).status).toBe("alarm");
    expect(() => classifyOxygen(0.19, { alarm: 0.17 })).toThrow(/evacuate ≤ alarm/);
  });

  it("refuses percentages passed as fractions", () => {
    expect(() => classifyOxygen(20.9)).toThrow(/above the range 0–1 \(a fraction, not %\)/);
  });
});
