// Facility rules: the local values the app uses everywhere (set by the facility admin).
import { z } from "zod";

export const contactSchema = z.object({
  name: z.string().min(1).max(80),
  role: z.string().min(1).max(80),
  phone: z.string().min(1).max(40),
});

export const facilityRulesValuesSchema = z.object({
  facilityName: z.string().min(1).max(120),
  /** Oxygen fraction (percent) at which the monitor warns. */
  oxygenAlarmPercent: z.number().min(15).max(21),
  /** Oxygen fraction (percent) at which the room is left. */
  oxygenEvacuatePercent: z.number().min(10).max(21),
  twoPersonTransfer: z.boolean(),
  ppe: z.array(z.string().min(1).max(80)).max(20),
  /** Minimum helium level per cryostat id (percent). */
  minHeliumPercent: z.record(z.string(), z.number().min(0).max(100)),
  /** Maximum magnet ramp rate per cryostat id (T/min). */
  maxRampTPerMin: z.record(z.string(), z.number().positive()),
  controlledAreaMilliTesla: z.number().positive(),
  controlledAreaNote: z.string().max(500),
  forecastWarnDays: z.number().int().min(0).max(60),
  /** Plausible band of transfer efficiency (litres gained / litres taken, percent) for the audit flag. */
  transferEfficiencyMinPercent: z.number().min(0).max(100).optional(),
  transferEfficiencyMaxPercent: z.number().min(0).max(100).optional(),
  /** Free air volume of the cryostat room (m³) and its ventilation, for oxygen estimates. */
  roomFreeVolumeM3: z.number().positive().max(100_000).optional(),
  roomAirChangesPerHour: z.number().min(0).max(100).optional(),
  contacts: z.array(contactSchema).max(20),
});
export type FacilityRulesValues = z.infer<typeof facilityRulesValuesSchema>;

/** The rules document (PDF) the facility attached to its rules. */
export type RulesDocument = { id: string; fileName: string; bytes: number; sha256: string; uploadedAt: string };
export type RulesInForce = {
  version: number;
  values: FacilityRulesValues;
  document: RulesDocument | null;
  changedBy: string;
  changedByName: string;
  changedAt: string;
};
