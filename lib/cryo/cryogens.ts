// Cryogen properties used by the helium, magnet and ODH arithmetic: liquid density and latent
// heat at the normal boiling point, and liquid → gas expansion ratios at named reference
// conditions. Source: data/cryogens-eos.json, computed with CoolProp 8.0.0 (helium after
// Ortiz-Vega et al., J. Phys. Chem. Ref. Data 2019; nitrogen after Span et al., J. Phys. Chem.
// Ref. Data 29 (2000)).

import eos from "./data/cryogens-eos.json";
import { requireNonNegative } from "./errors";

export type Cryogen = "helium" | "nitrogen";

/** Named gas reference conditions of the equation-of-state file (all at 1 atm = 101 325 Pa). */
export const GAS_REFERENCES = ["0C_1atm", "15C_1atm", "20C_1atm", "21.11C_1atm", "25C_1atm"] as const;
export type GasReference = (typeof GAS_REFERENCES)[number];

export interface CryogenProperties {
  readonly normalBoilingPointK: number;
  readonly liquidDensityKgPerM3: number;
  readonly latentHeatJPerKg: number;
  readonly molarMassKgPerMol: number;
  /** Litres of gas at the reference condition per litre of liquid at the normal boiling point. */
  readonly expansionRatio: Readonly<Record<GasReference, number>>;
}

type EosFluid = (typeof eos.fluids)["Helium"];

function fromEos(fluid: EosFluid): CryogenProperties {
  const ratios = {} as Record<GasReference, number>;
  for (const ref of GAS_REFERENCES) {
    ratios[ref] = fluid.gas_at_reference[ref].expansion_ratio_liquid_nbp_to_gas;
  }
  return {
    normalBoilingPointK: fluid.normal_boiling_point_K,
    liquidDensityKgPerM3: fluid.liquid_density_at_nbp_kg_m3,
    latentHeatJPerKg: fluid.latent_heat_at_nbp_J_kg,
    molarMassKgPerMol: fluid.molar_mass_kg_mol,
    expansionRatio: ratios,
  };
}

export const CRYOGENS: Readonly<Record<Cryogen, CryogenProperties>> = {
  helium: fromEos(eos.fluids.Helium),
  nitrogen: fromEos(eos.fluids.Nitrogen),
};

export interface GasVolume {
  readonly gasLitres: number;
  /** The reference condition always travels with a gas volume: ratios differ by ~9 % across them. */
  readonly reference: GasReference;
  readonly expansionRatio: number;
  readonly cryogen: Cryogen;
}

/** Gas litres at a named reference condition from litres of liquid at the normal boiling point. */
export function gasLitresFromLiquid(
  liquidLitres: number,
  reference: GasReference,
  cryogen: Cryogen = "helium",
): GasVolume {
  requireNonNegative("Liquid volume (L)", liquidLitres);
  const expansionRatio = CRYOGENS[cryogen]?.expansionRatio[reference];
  if (expansionRatio === undefined) {
    throw new RangeError(
      `Unknown cryogen or reference condition "${cryogen}", "${reference}" (known: ${GAS_REFERENCES.join(", ")})`,
    );
  }
  return { gasLitres: liquidLitres * expansionRatio, reference, expansionRatio, cryogen };
}

/** Energy in J that evaporates one litre of liquid at the normal boiling point (ρ·L). */
export function joulesPerLiquidLitre(cryogen: Cryogen = "helium"): number {
  const p = CRYOGENS[cryogen];
  return (p.liquidDensityKgPerM3 / 1000) * p.latentHeatJPerKg;
}
