// Physical constants for lib/cryo. Source: CODATA 2018 (Tiesinga et al., Rev. Mod. Phys. 93,
// 025010 (2021)); e, h, k_B and N_A are exact in the 2019 SI, the others derived or measured.

/** Elementary charge, C (exact). */
export const ELEMENTARY_CHARGE_C = 1.602176634e-19;
/** Planck constant, J·s (exact). */
export const PLANCK_J_S = 6.62607015e-34;
/** Reduced Planck constant ħ = h/2π, J·s. */
export const REDUCED_PLANCK_J_S = PLANCK_J_S / (2 * Math.PI);
/** Boltzmann constant, J/K (exact). */
export const BOLTZMANN_J_PER_K = 1.380649e-23;
/** Avogadro constant, 1/mol (exact). */
export const AVOGADRO_PER_MOL = 6.02214076e23;
/** Molar gas constant R = N_A·k_B, J/(mol·K) (exact). */
export const GAS_CONSTANT_J_PER_MOL_K = AVOGADRO_PER_MOL * BOLTZMANN_J_PER_K;
/** Vacuum magnetic permeability μ0, N/A² (CODATA 2018, measured in the 2019 SI). */
export const VACUUM_PERMEABILITY_N_PER_A2 = 1.25663706212e-6;
/** Standard atmosphere, Pa (exact by definition). */
export const STANDARD_ATMOSPHERE_PA = 101_325;
/** 0 °C in K (exact by definition). */
export const ZERO_CELSIUS_K = 273.15;
