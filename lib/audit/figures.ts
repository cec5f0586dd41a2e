// Computed figures for transfer and quench records (through lib/cryo): transfer efficiency, boil-off
// since the previous transfer, gas released to recovery; helium lost in a quench, its gas volume and
// the room's oxygen estimate. Every figure carries its basis; oxygen figures are estimates.
import {
  gasLitresFromLiquid,
  type LevelCalibration,
  litresFromLevel,
  oxygenAfterMixedRelease,
  quenchBoilOffLitresMax,
  quenchGasVolume,
  storedEnergyJ,
  transferEfficiency,
} from "@/lib/cryo";

/** Reference condition for gas volumes shown in the audit (room temperature, 1 atm). */
export const GAS_REFERENCE = "20C_1atm" as const;

type TransferLike = {
  levelBeforePercent: number;
  levelAfterPercent: number;
  suppliedLitres: number;
  gainedLitres: number;
};

export type TransferFigures = {
  efficiencyPercent: number | null;
  lossLitres: number;
  /** Liquid lost on the way, as gas at 20 °C and 1 atm, sent to the recovery line. */
  gasToRecoveryLitres: number;
  gasReference: typeof GAS_REFERENCE;
  /** Liquid in the reservoir before and after, from the level calibration, when known. */
  litresBefore: number | null;
  litresAfter: number | null;
  boilOff: { litres: number; days: number; litresPerDay: number } | null;
};

function safeLitres(percent: number | undefined, calibration: LevelCalibration | undefined): number | null {
  if (percent === undefined || !calibration) return null;
  try {
    return litresFromLevel(percent, calibration);
  } catch {
    return null; // a level outside the calibration's range: no figure rather than a wrong one
  }
}

/**
 * `previous`: the cryostat's previous transfer (its level after and time), for the boil-off in
 * between; `at`: this transfer's time (ISO).
 */
export function transferFigures(
  t: TransferLike,
  opts: {
    calibration?: LevelCalibration;
    previous?: { levelAfterPercent: number; at: string } | null;
    at?: string;
  } = {},
): TransferFigures {
  const eff = t.suppliedLitres > 0 ? transferEfficiency(t.gainedLitres, t.suppliedLitres) : null;
  const loss = Math.max(0, t.suppliedLitres - t.gainedLitres);
  const gas = gasLitresFromLiquid(loss, GAS_REFERENCE);
  const litresBefore = safeLitres(t.levelBeforePercent, opts.calibration);
  const litresAfter = safeLitres(t.levelAfterPercent, opts.calibration);
  let boilOff: TransferFigures["boilOff"] = null;
  if (opts.previous && opts.at) {
    const prevLitres = safeLitres(opts.previous.levelAfterPercent, opts.calibration);
    const days = (Date.parse(opts.at) - Date.parse(opts.previous.at)) / 86_400_000;
    if (prevLitres !== null && litresBefore !== null && days > 0) {
      const litres = prevLitres - litresBefore;
      boilOff = { litres, days, litresPerDay: litres / days };
    }
  }
  return {
    efficiencyPercent: eff ? eff.efficiency * 100 : null,
    lossLitres: loss,
    gasToRecoveryLitres: gas.gasLitres,
    gasReference: GAS_REFERENCE,
    litresBefore,
    litresAfter,
    boilOff,
  };
}

type QuenchLike = {
  fieldT: number;
  currentA?: number;
  levelBeforePercent?: number;
  levelAfterPercent?: number;
  heliumLostLitres?: number;
};

export type QuenchFigures = {
  heliumLostLitres: number | null;
  heliumLostBasis: "levels" | "recorded" | "stored_energy_upper_bound" | null;
  storedEnergyJ: number | null;
  gasM3: number | null;
  gasReference: typeof GAS_REFERENCE;
  /** Estimated oxygen fraction (0–1) after the gas mixes into the room while mixed air leaves
   * (lib/cryo oxygenAfterMixedRelease, C_air·e^(−Vgas/V)), when the room volume is known. */
  oxygenEstimateFraction: number | null;
};

export function quenchFigures(
  q: QuenchLike,
  opts: { calibration?: LevelCalibration; inductanceH?: number; roomFreeVolumeM3?: number } = {},
): QuenchFigures {
  const before = safeLitres(q.levelBeforePercent, opts.calibration);
  const after = safeLitres(q.levelAfterPercent, opts.calibration);
  const energy =
    opts.inductanceH !== undefined && q.currentA !== undefined ? storedEnergyJ(opts.inductanceH, q.currentA) : null;
  let lost: number | null = null;
  let basis: QuenchFigures["heliumLostBasis"] = null;
  if (before !== null && after !== null) {
    lost = Math.max(0, before - after);
    basis = "levels";
  } else if (q.heliumLostLitres !== undefined) {
    lost = q.heliumLostLitres;
    basis = "recorded";
  } else if (energy !== null) {
    lost = quenchBoilOffLitresMax(energy);
    basis = "stored_energy_upper_bound";
  }
  const gasM3 = lost !== null ? quenchGasVolume(lost, GAS_REFERENCE).gasM3 : null;
  const oxygen =
    gasM3 !== null && opts.roomFreeVolumeM3
      ? oxygenAfterMixedRelease({ roomVolumeM3: opts.roomFreeVolumeM3, gasVolumeM3: gasM3 })
      : null;
  return {
    heliumLostLitres: lost,
    heliumLostBasis: basis,
    storedEnergyJ: energy,
    gasM3,
    gasReference: GAS_REFERENCE,
    oxygenEstimateFraction: oxygen,
  };
}
