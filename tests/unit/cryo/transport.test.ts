// Transport arithmetic against the CODATA 2018 exact constants (2019 SI) [pub], mathjs physical
// constants, lib/cryo/README.md [calc] values, and ml-levenberg-marquardt on synthetic Kondo data.
// The empirical Kondo form (Goldhaber-Gordon et al., Phys. Rev. Lett. 81, 5225 (1998)) is quoted
// from memory for its exact printed form.
import * as math from "mathjs";
import { levenbergMarquardt } from "ml-levenberg-marquardt";
import { describe, expect, it } from "vitest";
import {
  aharonovBohmPeriodT,
  BOLTZMANN_J_PER_K,
  CONDUCTANCE_QUANTUM_S,
  ELEMENTARY_CHARGE_C,
  FLUX_QUANTUM_H_OVER_2E_WB,
  FLUX_QUANTUM_H_OVER_E_WB,
  fitKondo,
  fluxQuantaThroughRing,
  kondoCloudLengthM,
  kondoConductance,
  PLANCK_J_S,
  REDUCED_PLANCK_J_S,
} from "@/lib/cryo";

const mathjsChargeIsExact2019 = math.elementaryCharge.toNumber("C") === 1.602176634e-19;

describe("constants (CODATA 2018, exact in the 2019 SI)", () => {
  it("mathjs carries the exact 2019 elementary charge (else it is used only where it agrees)", () => {
    expect(mathjsChargeIsExact2019).toBe(true);
  });

  it("e, h, k_B exact; ħ = h/2π — agree with mathjs", () => {
    expect(ELEMENTARY_CHARGE_C).toBe(1.602176634e-19);
    expect(PLANCK_J_S).toBe(6.62607015e-34);
    expect(BOLTZMANN_J_PER_K).toBe(1.380649e-23);
    expect(math.planckConstant.toNumber("J s") / PLANCK_J_S).toBeCloseTo(1, 14);
    expect(math.boltzmann.toNumber("J/K") / BOLTZMANN_J_PER_K).toBeCloseTo(1, 14);
    expect(math.reducedPlanckConstant.toNumber("J s") / REDUCED_PLANCK_J_S).toBeCloseTo(1, 14);
  });

  it("G0 = 2e²/h = 7.748 091 729 86e−5 S; h/e = 4.135 667 697e−15 Wb; h/2e = 2.067 833 848e−15 Wb", () => {
    expect(CONDUCTANCE_QUANTUM_S / 7.74809172986e-5).toBeCloseTo(1, 11);
    expect(FLUX_QUANTUM_H_OVER_E_WB / 4.135667697e-15).toBeCloseTo(1, 9);
    expect(FLUX_QUANTUM_H_OVER_2E_WB / 2.067833848e-15).toBeCloseTo(1, 9);
    if (mathjsChargeIsExact2019) {
      expect(math.conductanceQuantum.toNumber("S") / CONDUCTANCE_QUANTUM_S).toBeCloseTo(1, 14);
      expect(math.magneticFluxQuantum.toNumber("Wb") / FLUX_QUANTUM_H_OVER_2E_WB).toBeCloseTo(1, 14);
    }
  });
});

describe("Aharonov–Bohm ring", () => {
  it("1 µm mean diameter → ΔB = 5.2657 mT (lib/cryo/README.md [calc]); mathjs unit check in mT", () => {
    const period = aharonovBohmPeriodT({ meanDiameterM: 1e-6 });
    expect(period * 1e3).toBeCloseTo(5.2657, 4);
    const viaMathjs = math.divide(
      math.unit(FLUX_QUANTUM_H_OVER_E_WB, "Wb"),
      math.unit(Math.PI * 0.25, "um^2"),
    ) as math.Unit;
    expect(viaMathjs.toNumber("mT")).toBeCloseTo(period * 1e3, 10);
  });

  it("0.8 µm ring (demo chip) → ≈ 8.2 mT; one period threads exactly one flux quantum", () => {
    const ring = { meanDiameterM: 0.8e-6 };
    expect(aharonovBohmPeriodT(ring) * 1e3).toBeCloseTo(8.23, 2);
    expect(fluxQuantaThroughRing(aharonovBohmPeriodT(ring), ring)).toBeCloseTo(1, 12);
    expect(fluxQuantaThroughRing(0.1, { areaM2: 1e-12 })).toBeCloseTo(0.1e-12 / 4.135667697e-15, 6);
    expect(() => aharonovBohmPeriodT({ meanDiameterM: 0 })).toThrow(RangeError);
  });
});

describe("Kondo conductance", () => {
  const p = { kondoTemperatureK: 0.35, conductanceAtZeroK: 1.2 };

  it("G(T_K) = G(0)/2 by construction, for any s", () => {
    expect(kondoConductance(0.35, p)).toBeCloseTo(0.6, 12);
    expect(kondoConductance(0.35, { ...p, s: 0.3 })).toBeCloseTo(0.6, 12);
    expect(kondoConductance(0, p)).toBeCloseTo(1.2, 12);
  });

  it("falls monotonically with T and adds a background", () => {
    expect(kondoConductance(0.1, p)).toBeGreaterThan(kondoConductance(0.2, p));
    expect(kondoConductance(0.35, { ...p, background: 0.1 })).toBeCloseTo(0.7, 12);
    expect(() => kondoConductance(-1, p)).toThrow(RangeError);
  });
});

/** Synthetic series 20 mK – 1 K with a deterministic ±0.5 % ripple standing in for noise. */
function synthetic(background = 0): { temperatureK: number; conductance: number }[] {
  const p = { kondoTemperatureK: 0.35, conductanceAtZeroK: 1.2, background };
  return Array.from({ length: 25 }, (_, i) => {
    const t = 0.02 * 50 ** (i / 24);
    const noise = 0.005 * Math.sin(7.3 * i + 1);
    return { temperatureK: t, conductance: kondoConductance(t, p) + noise };
  });
}

describe("fitKondo", () => {
  it("recovers T_K = 0.35 K and G(0) = 1.2 (2e²/h) from noisy synthetic data", () => {
    const fit = fitKondo(synthetic());
    expect(fit.converged).toBe(true);
    expect(Math.abs(fit.kondoTemperatureK - 0.35)).toBeLessThan(0.01);
    expect(Math.abs(fit.conductanceAtZeroK - 1.2)).toBeLessThan(0.01);
    expect(fit.kondoTemperatureStandardErrorK).toBeGreaterThan(0);
    expect(fit.kondoTemperatureStandardErrorK).toBeLessThan(0.01);
    expect(fit.residualRms).toBeLessThan(0.005);
    // the truth lies within 4 standard errors
    expect(Math.abs(fit.kondoTemperatureK - 0.35)).toBeLessThan(4 * fit.kondoTemperatureStandardErrorK);
  });

  it("exact data → exact parameters and zero residual", () => {
    const exact = synthetic().map(({ temperatureK }) => ({
      temperatureK,
      conductance: kondoConductance(temperatureK, { kondoTemperatureK: 0.35, conductanceAtZeroK: 1.2 }),
    }));
    const fit = fitKondo(exact);
    expect(fit.kondoTemperatureK).toBeCloseTo(0.35, 8);
    expect(fit.conductanceAtZeroK).toBeCloseTo(1.2, 8);
    expect(fit.residualRms).toBeLessThan(1e-9);
  });

  it("fits a constant background when asked", () => {
    const fit = fitKondo(synthetic(0.15), { background: true });
    expect(Math.abs(fit.kondoTemperatureK - 0.35)).toBeLessThan(0.02);
    expect(Math.abs((fit.background ?? NaN) - 0.15)).toBeLessThan(0.02);
    expect(fit.backgroundStandardError).toBeGreaterThan(0);
  });

  it("agrees with ml-levenberg-marquardt on the same data", () => {
    const data = synthetic();
    const ours = fitKondo(data);
    const a = 2 ** (1 / 0.22) - 1;
    const reference = levenbergMarquardt(
      { x: data.map((d) => d.temperatureK), y: data.map((d) => d.conductance) },
      ([tk = 1, g0 = 1]) =>
        (t: number) =>
          g0 * (1 + a * (t / tk) ** 2) ** -0.22,
      { initialValues: [0.3, 1.0], maxIterations: 1000, errorTolerance: 1e-12, damping: 1e-3 },
    );
    expect(reference.parameterValues[0]).toBeCloseTo(ours.kondoTemperatureK, 3);
    expect(reference.parameterValues[1]).toBeCloseTo(ours.conductanceAtZeroK, 3);
  });

  it("refuses fewer than 4 points", () => {
    expect(() => fitKondo(synthetic().slice(0, 3))).toThrow(/at least 4 points/);
    expect(() => fitKondo([{ temperatureK: 0, conductance: 1 }, ...synthetic()])).toThrow(RangeError);
  });
});

describe("kondoCloudLengthM", () => {
  it("ħ v_F/(k_B T_K): v_F = 1e5 m/s, T_K = 0.35 K → ≈ 2.18 µm", () => {
    const xi = kondoCloudLengthM(1e5, 0.35);
    const viaMathjs = math.divide(
      math.multiply(math.reducedPlanckConstant, math.unit(1e5, "m/s")),
      math.multiply(math.boltzmann, math.unit(0.35, "K")),
    ) as math.Unit;
    expect(xi).toBeCloseTo(viaMathjs.toNumber("m"), 15);
    expect(xi * 1e6).toBeCloseTo(2.182, 3);
    expect(() => kondoCloudLengthM(1e5, 0)).toThrow(RangeError);
  });
});
