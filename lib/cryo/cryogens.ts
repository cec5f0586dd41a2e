// Cryogen properties used by the helium, magnet and ODH arithmetic: liquid density and latent
// heat at the normal boiling point or at a bath's saturation pressure or temperature (the eos
// saturation table), and liquid → gas expansion ratios at named reference conditions. Source: data/cryogens-eos.json, computed with CoolProp 8.0.0 (helium after
// Ortiz-Vega et al., J. Phys. Chem. Ref. Data 2019; nitrogen after Span et al., J. Phys. Chem.
// Ref. Data 29 (2000)).

import { STANDARD_ATMOSPHERE_PA } from "./constants";
import eos from "./data/cryogens-eos.json";
import { fmt, requireInRange, requireNonNegative } from "./errors";
import { pchip } from "./interp";

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

/** A liquid bath at saturation, given by its (absolute) pressure or its temperature. */
export type BathState = { readonly pressurePa: number } | { readonly temperatureK: number };

export interface SaturatedLiquid {
  readonly cryogen: Cryogen;
  readonly temperatureK: number;
  /** Absolute pressure. */
  readonly pressurePa: number;
  readonly liquidDensityKgPerM3: number;
  readonly latentHeatJPerKg: number;
  /** True when no bath was given: the figures hold at 1 atm (the normal boiling point) only. */
  readonly atNormalBoilingPoint: boolean;
}

interface SaturationRow {
  readonly T_K: number;
  readonly p_sat_Pa: number;
  readonly liquid_density_kg_m3: number;
  readonly latent_heat_J_kg: number;
}

const EOS_FLUID: Readonly<Record<Cryogen, EosFluid>> = { helium: eos.fluids.Helium, nitrogen: eos.fluids.Nitrogen };

/** The eos file's saturation rows, with the normal boiling point added where no row is near it. */
function saturationRows(cryogen: Cryogen): SaturationRow[] {
  const fluid = EOS_FLUID[cryogen];
  const rows: SaturationRow[] = [...fluid.saturation];
  const nbp = fluid.normal_boiling_point_K;
  if (!rows.some((r) => Math.abs(r.T_K - nbp) < 0.01)) {
    rows.push({
      T_K: nbp,
      p_sat_Pa: STANDARD_ATMOSPHERE_PA,
      liquid_density_kg_m3: fluid.liquid_density_at_nbp_kg_m3,
      latent_heat_J_kg: fluid.latent_heat_at_nbp_J_kg,
    });
  }
  return rows.sort((a, b) => a.T_K - b.T_K);
}

const SATURATION: Readonly<Record<Cryogen, readonly SaturationRow[]>> = {
  helium: saturationRows("helium"),
  nitrogen: saturationRows("nitrogen"),
};

export interface SaturationRange {
  readonly temperatureMinK: number;
  readonly temperatureMaxK: number;
  readonly pressureMinPa: number;
  readonly pressureMaxPa: number;
}

/** The span of the eos saturation table: helium 2.2–5.0 K, nitrogen 65–90 K. */
export const SATURATION_RANGE: Readonly<Record<Cryogen, SaturationRange>> = {
  helium: rangeOf(SATURATION.helium),
  nitrogen: rangeOf(SATURATION.nitrogen),
};

function rangeOf(rows: readonly SaturationRow[]): SaturationRange {
  const first = rows[0];
  const last = rows[rows.length - 1];
  if (!first || !last) throw new Error("empty saturation table");
  return {
    temperatureMinK: first.T_K,
    temperatureMaxK: last.T_K,
    pressureMinPa: first.p_sat_Pa,
    pressureMaxPa: last.p_sat_Pa,
  };
}

/**
 * Saturated liquid density and latent heat at a bath's pressure or temperature, from the eos file's
 * saturation table, by monotone cubic interpolation (Fritsch–Carlson) between its rows: density and
 * latent heat against T, p ↔ T as ln p against 1/T (the Clausius–Clapeyron variables). No bath: the normal boiling point (1 atm). Outside the table
 * (e.g. a helium bath pumped below 2.2 K) it refuses: the 1 atm figures do not hold there either.
 */
export function saturatedLiquid(cryogen: Cryogen = "helium", bath?: BathState): SaturatedLiquid {
  const p = CRYOGENS[cryogen];
  if (!p) throw new RangeError(`Unknown cryogen "${String(cryogen)}" (known: helium, nitrogen)`);
  if (bath === undefined) {
    return {
      cryogen,
      temperatureK: p.normalBoilingPointK,
      pressurePa: STANDARD_ATMOSPHERE_PA,
      liquidDensityKgPerM3: p.liquidDensityKgPerM3,
      latentHeatJPerKg: p.latentHeatJPerKg,
      atNormalBoilingPoint: true,
    };
  }
  const rows = SATURATION[cryogen];
  const range = SATURATION_RANGE[cryogen];
  const text = (what: string) =>
    `equation-of-state saturation table's range for ${cryogen} (${fmt(range.temperatureMinK)}–${fmt(range.temperatureMaxK)} K, ` +
    `${fmt(range.pressureMinPa, 5)}–${fmt(range.pressureMaxPa, 5)} Pa); the 1 atm figures do not hold for this ${what}`;
  const temps = rows.map((r) => r.T_K);
  const lnP = rows.map((r) => Math.log(r.p_sat_Pa));
  let temperatureK: number;
  let pressurePa: number;
  if ("pressurePa" in bath) {
    pressurePa = requireInRange("Bath pressure", bath.pressurePa, {
      min: range.pressureMinPa,
      max: range.pressureMaxPa,
      unit: "Pa",
      text: text("bath"),
    });
    temperatureK =
      1 /
      pchip(
        lnP,
        temps.map((t) => 1 / t),
      )(Math.log(pressurePa));
  } else {
    temperatureK = requireInRange("Bath temperature", bath.temperatureK, {
      min: range.temperatureMinK,
      max: range.temperatureMaxK,
      unit: "K",
      text: text("bath"),
    });
    pressurePa = Math.exp(
      pchip(
        temps.map((t) => -1 / t),
        lnP,
      )(-1 / temperatureK),
    );
  }
  return {
    cryogen,
    temperatureK,
    pressurePa,
    liquidDensityKgPerM3: pchip(
      temps,
      rows.map((r) => r.liquid_density_kg_m3),
    )(temperatureK),
    latentHeatJPerKg: pchip(
      temps,
      rows.map((r) => r.latent_heat_J_kg),
    )(temperatureK),
    atNormalBoilingPoint: false,
  };
}
