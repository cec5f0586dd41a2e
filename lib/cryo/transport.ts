// Mesoscopic transport arithmetic: conductance and flux quanta (CODATA 2018 exact constants), the
// Aharonov–Bohm period of a ring, the empirical Kondo conductance
//   G(T) = G(0)·[1 + (2^{1/s} − 1)(T/T_K)²]^{−s},  s ≈ 0.22
// (Goldhaber-Gordon et al., Phys. Rev. Lett. 81, 5225 (1998); the exact printed form is from
// memory), a least-squares fit of T_K and G(0) with standard errors, and the Kondo cloud length
// ħ v_F/(k_B T_K).

import { BOLTZMANN_J_PER_K, ELEMENTARY_CHARGE_C, PLANCK_J_S, REDUCED_PLANCK_J_S } from "./constants";
import { CryoInputError, requireFinite, requireNonNegative, requirePositive } from "./errors";
import { levenbergMarquardt, type NonlinearModel } from "./lsq";

/** Conductance quantum 2e²/h in S. */
export const CONDUCTANCE_QUANTUM_S = (2 * ELEMENTARY_CHARGE_C ** 2) / PLANCK_J_S;
/** Flux quantum h/e in Wb (the Aharonov–Bohm period of a normal ring). */
export const FLUX_QUANTUM_H_OVER_E_WB = PLANCK_J_S / ELEMENTARY_CHARGE_C;
/** Superconducting flux quantum h/2e in Wb. */
export const FLUX_QUANTUM_H_OVER_2E_WB = PLANCK_J_S / (2 * ELEMENTARY_CHARGE_C);

export type RingGeometry = { areaM2: number } | { meanDiameterM: number };

/** Enclosed area in m² of a ring given by its area or its mean diameter (circle). */
export function ringAreaM2(ring: RingGeometry): number {
  if ("areaM2" in ring) return requirePositive("Ring area (m²)", ring.areaM2);
  const d = requirePositive("Mean diameter (m)", ring.meanDiameterM);
  return (Math.PI * d * d) / 4;
}

/** Aharonov–Bohm period ΔB = (h/e)/A in T. */
export function aharonovBohmPeriodT(ring: RingGeometry): number {
  return FLUX_QUANTUM_H_OVER_E_WB / ringAreaM2(ring);
}

/** Number of flux quanta h/e threading the ring at a field. */
export function fluxQuantaThroughRing(fieldT: number, ring: RingGeometry): number {
  requireFinite("Field (T)", fieldT);
  return (fieldT * ringAreaM2(ring)) / FLUX_QUANTUM_H_OVER_E_WB;
}

/** Conductance in units of 2e²/h from siemens. */
export function conductanceInQuanta(conductanceS: number): number {
  return requireFinite("Conductance (S)", conductanceS) / CONDUCTANCE_QUANTUM_S;
}

export const KONDO_DEFAULT_S = 0.22;

export interface KondoParameters {
  readonly kondoTemperatureK: number;
  /** Conductance at T = 0, in any unit; G(T) comes back in the same unit. */
  readonly conductanceAtZeroK: number;
  readonly s?: number;
  /** Constant background added to the Kondo term (same unit), default 0. */
  readonly background?: number;
}

function kondoShape(temperatureK: number, kondoTemperatureK: number, s: number): number {
  const a = 2 ** (1 / s) - 1;
  return 1 + a * (temperatureK / kondoTemperatureK) ** 2;
}

/** Empirical Kondo conductance G(T); by construction G(T_K) = G(0)/2 (without background). */
export function kondoConductance(temperatureK: number, p: KondoParameters): number {
  requireNonNegative("Temperature (K)", temperatureK);
  requirePositive("Kondo temperature (K)", p.kondoTemperatureK);
  requireFinite("G(0)", p.conductanceAtZeroK);
  const s = requirePositive("s", p.s ?? KONDO_DEFAULT_S);
  const background = requireFinite("Background", p.background ?? 0);
  return p.conductanceAtZeroK * kondoShape(temperatureK, p.kondoTemperatureK, s) ** -s + background;
}

export interface ConductancePoint {
  readonly temperatureK: number;
  /** Any unit (S or 2e²/h); the fitted G(0) and background come back in it. */
  readonly conductance: number;
}

export interface KondoFit {
  readonly kondoTemperatureK: number;
  readonly kondoTemperatureStandardErrorK: number;
  readonly conductanceAtZeroK: number;
  readonly conductanceAtZeroKStandardError: number;
  /** Present when the fit included a constant background. */
  readonly background?: number;
  readonly backgroundStandardError?: number;
  readonly s: number;
  readonly residualRms: number;
  readonly iterations: number;
  readonly converged: boolean;
}

export const MIN_KONDO_POINTS = 4;

/** Parameters: [ln T_K, G(0), background?]. T_K is fitted in log so it stays positive. */
function kondoModel(s: number, withBackground: boolean): NonlinearModel {
  const a = 2 ** (1 / s) - 1;
  return {
    value: ([lnTk = 0, g0 = 0, bg = 0], t) => g0 * kondoShape(t, Math.exp(lnTk), s) ** -s + (withBackground ? bg : 0),
    gradient: ([lnTk = 0, g0 = 0], t) => {
      const u = kondoShape(t, Math.exp(lnTk), s);
      const x2 = (t / Math.exp(lnTk)) ** 2;
      // ∂G/∂lnT_K = G(0)·(−s)·u^{−s−1}·(−2a·x²)
      const grad = [2 * s * a * g0 * x2 * u ** (-s - 1), u ** -s];
      return withBackground ? [...grad, 1] : grad;
    },
  };
}

/** Starting values: G(0) from the coldest point, T_K where G first falls to half of it. */
function initialGuess(points: readonly ConductancePoint[]): [number, number] {
  const sorted = [...points].sort((p, q) => p.temperatureK - q.temperatureK);
  const g0 = sorted[0]?.conductance ?? 1;
  const half = sorted.find((p) => p.conductance <= g0 / 2);
  const mid = sorted[Math.floor(sorted.length / 2)]?.temperatureK ?? 1;
  return [Math.max(half?.temperatureK ?? mid, 1e-6), g0];
}

/**
 * Least-squares fit of T_K and G(0) (and optionally a constant background) to G(T) data, with
 * standard errors from the Jacobian at the optimum (s fixed). Refuses fewer than 4 points.
 */
export function fitKondo(
  points: readonly ConductancePoint[],
  { s = KONDO_DEFAULT_S, background = false }: { s?: number; background?: boolean } = {},
): KondoFit {
  if (points.length < MIN_KONDO_POINTS) {
    throw new CryoInputError(`A Kondo fit needs at least ${MIN_KONDO_POINTS} points (got ${points.length})`);
  }
  requirePositive("s", s);
  points.forEach((p) => {
    requirePositive("Temperature (K)", p.temperatureK);
    requireFinite("Conductance", p.conductance);
  });
  const [tk0, g00] = initialGuess(points);
  const fit = levenbergMarquardt(
    kondoModel(s, background),
    points.map((p) => p.temperatureK),
    points.map((p) => p.conductance),
    background ? [Math.log(tk0), g00, 0] : [Math.log(tk0), g00],
  );
  const [lnTk = NaN, g0 = NaN, bg = NaN] = fit.parameters;
  const [seLnTk = NaN, seG0 = NaN, seBg = NaN] = fit.standardErrors;
  const tk = Math.exp(lnTk);
  return {
    kondoTemperatureK: tk,
    kondoTemperatureStandardErrorK: tk * seLnTk, // delta method: σ(T_K) = T_K·σ(ln T_K)
    conductanceAtZeroK: g0,
    conductanceAtZeroKStandardError: seG0,
    ...(background ? { background: bg, backgroundStandardError: seBg } : {}),
    s,
    residualRms: fit.residualRms,
    iterations: fit.iterations,
    converged: fit.converged,
  };
}

/** Kondo screening-cloud length ξ_K = ħ v_F/(k_B T_K) in m. */
export function kondoCloudLengthM(fermiVelocityMPerS: number, kondoTemperatureK: number): number {
  requirePositive("Fermi velocity (m/s)", fermiVelocityMPerS);
  requirePositive("Kondo temperature (K)", kondoTemperatureK);
  return (REDUCED_PLANCK_J_S * fermiVelocityMPerS) / (BOLTZMANN_J_PER_K * kondoTemperatureK);
}
