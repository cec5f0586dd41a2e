// Superconducting magnet arithmetic: field ↔ current by the coil constant, ramp time, stored
// energy ½LI², the helium a quench can boil at most, and the far-field distance of a field
// contour (default 0.5 mT, IEC 60601-2-33 up to its 3rd edition; the 4th edition uses 0.9 mT).
// Dipole far field |B| = (μ0 m / 4π r³)·√(1 + 3cos²θ) (textbook magnetostatics).
// Everything here is an estimate for planning; the maker's data, the fringe-field map, the site
// survey and the facility's magnet-safety rules decide.

import { VACUUM_PERMEABILITY_N_PER_A2 } from "./constants";
import { type Cryogen, joulesPerLiquidLitre } from "./cryogens";
import { fmt, requireFinite, requireInRange, requireNonNegative, requirePositive } from "./errors";

export interface MagnetSpec {
  readonly coilConstantTPerA: number;
  readonly maxCurrentA: number;
  readonly inductanceH?: number;
  /** The maker's ramp-rate limit (may depend on field; give the lowest that applies). */
  readonly rampLimitTPerMin?: number;
}

function checkCurrent(currentA: number, magnet: MagnetSpec): void {
  requirePositive("Maximum current (A)", magnet.maxCurrentA);
  requireInRange("Current", currentA, {
    min: -magnet.maxCurrentA,
    max: magnet.maxCurrentA,
    unit: "A",
    text: `magnet's rating (±${fmt(magnet.maxCurrentA)} A)`,
  });
}

/** Field in T at the centre from the coil current. */
export function fieldFromCurrent(currentA: number, magnet: MagnetSpec): number {
  requirePositive("Coil constant (T/A)", magnet.coilConstantTPerA);
  checkCurrent(currentA, magnet);
  return currentA * magnet.coilConstantTPerA;
}

/** Current in A that gives the field; refused above the magnet's maximum current. */
export function currentFromField(fieldT: number, magnet: MagnetSpec): number {
  requirePositive("Coil constant (T/A)", magnet.coilConstantTPerA);
  requireFinite("Field (T)", fieldT);
  const currentA = fieldT / magnet.coilConstantTPerA;
  checkCurrent(currentA, magnet);
  return currentA;
}

export interface RampTime {
  readonly seconds: number;
  readonly minutes: number;
}

/** Time to ramp between two fields at a rate in T/min; refused above the magnet's ramp limit. */
export function rampTime(fromFieldT: number, toFieldT: number, rampRateTPerMin: number, magnet?: MagnetSpec): RampTime {
  requireFinite("Start field (T)", fromFieldT);
  requireFinite("Target field (T)", toFieldT);
  requirePositive("Ramp rate (T/min)", rampRateTPerMin);
  if (magnet) {
    currentFromField(fromFieldT, magnet);
    currentFromField(toFieldT, magnet);
    if (magnet.rampLimitTPerMin !== undefined) {
      requireInRange("Ramp rate", rampRateTPerMin, {
        min: 0,
        max: magnet.rampLimitTPerMin,
        unit: "T/min",
        text: `magnet's ramp limit (${fmt(magnet.rampLimitTPerMin)} T/min)`,
      });
    }
  }
  const minutes = Math.abs(toFieldT - fromFieldT) / rampRateTPerMin;
  return { minutes, seconds: minutes * 60 };
}

/** Stored energy ½LI² in J. */
export function storedEnergyJ(inductanceH: number, currentA: number): number {
  requirePositive("Inductance (H)", inductanceH);
  requireFinite("Current (A)", currentA);
  return 0.5 * inductanceH * currentA * currentA;
}

/**
 * Upper bound on the liquid boiled by a quench: all stored energy into latent heat, E/(ρ·L).
 * Real quenches dump part of the energy into the coil and the dump resistor.
 */
export function quenchBoilOffLitresMax(energyJ: number, cryogen: Cryogen = "helium"): number {
  requireNonNegative("Stored energy (J)", energyJ);
  return energyJ / joulesPerLiquidLitre(cryogen);
}

export type DipoleDirection = "axis" | "equator";

const MU0_OVER_4PI = VACUUM_PERMEABILITY_N_PER_A2 / (4 * Math.PI);
const ANGLE_FACTOR: Record<DipoleDirection, number> = { axis: 2, equator: 1 };

/** Dipole moment in A·m² from a far-field reading at a known distance on the axis or equator. */
export function dipoleMomentFromField(fieldT: number, distanceM: number, direction: DipoleDirection): number {
  requirePositive("Field (T)", fieldT);
  requirePositive("Distance (m)", distanceM);
  return (fieldT * distanceM ** 3) / (MU0_OVER_4PI * ANGLE_FACTOR[direction]);
}

export interface ContourEstimate {
  readonly estimate: true;
  readonly contourT: number;
  readonly dipoleMomentAm2: number;
  readonly axisDistanceM: number;
  readonly equatorDistanceM: number;
}

export type DipoleSource =
  | { dipoleMomentAm2: number }
  | { fieldT: number; distanceM: number; direction: DipoleDirection };

/**
 * Distance from the magnet centre to a field contour (default 0.5 mT), on the axis and on the
 * equator, from the dipole far field. An estimate only: near the magnet the dipole form fails,
 * and shielded magnets and nearby steel change the map.
 */
export function contourDistance(source: DipoleSource, contourT = 0.5e-3): ContourEstimate {
  requirePositive("Contour field (T)", contourT);
  const dipoleMomentAm2 =
    "dipoleMomentAm2" in source
      ? requirePositive("Dipole moment (A·m²)", source.dipoleMomentAm2)
      : dipoleMomentFromField(source.fieldT, source.distanceM, source.direction);
  const distance = (direction: DipoleDirection) =>
    Math.cbrt((MU0_OVER_4PI * ANGLE_FACTOR[direction] * dipoleMomentAm2) / contourT);
  return {
    estimate: true,
    contourT,
    dipoleMomentAm2,
    axisDistanceM: distance("axis"),
    equatorDistanceM: distance("equator"),
  };
}
