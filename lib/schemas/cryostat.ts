// Cryostat parameters (typed JSON on the cryostats row): thermometer stages, helium reservoir
// calibration, magnet and mixture parameters. One schema for the server, the tablet and the admin form.
import { z } from "zod";

export const CRYOSTAT_KINDS = ["dry_dilution", "wet_bath", "test_dewar"] as const;
export type CryostatKind = (typeof CRYOSTAT_KINDS)[number];

export const stageSchema = z.object({
  key: z.string().min(1).max(40),
  label: z.string().min(1).max(60),
  /** Typical temperature when cold, for plausibility hints (K). */
  nominalK: z.number().positive(),
});

export const reservoirCalibrationSchema = z.discriminatedUnion("kind", [
  z.object({ kind: z.literal("linear"), litresPerPercent: z.number().positive(), offsetLitres: z.number() }),
  z.object({
    kind: z.literal("table"),
    points: z.array(z.object({ percent: z.number().min(0).max(100), litres: z.number().min(0) })).min(2),
  }),
]);

export const reservoirSchema = z.object({
  capacityLitres: z.number().positive(),
  minimumPercent: z.number().min(0).max(100),
  calibration: reservoirCalibrationSchema,
});

export const magnetSchema = z.object({
  coilConstantTPerA: z.number().positive(),
  maxCurrentA: z.number().positive(),
  inductanceH: z.number().positive(),
  rampLimitTPerMin: z.number().positive(),
  persistentSwitch: z.boolean(),
  /** Effective dipole moment for the fringe-field estimate (A·m²), if the maker gives none. */
  dipoleMomentAm2: z.number().positive().optional(),
});

export const cryostatConfigSchema = z.object({
  stages: z.array(stageSchema).min(1),
  reservoir: reservoirSchema.optional(),
  magnet: magnetSchema.optional(),
  mixture: z.object({ tankVolumeLitres: z.number().positive() }).optional(),
  /** Has a pumped 4He pot or VTI read by vapour pressure. */
  vapourPressureStage: z.string().optional(),
  description: z.string().max(500).optional(),
});
export type CryostatConfig = z.infer<typeof cryostatConfigSchema>;

export const CRYOSTAT_STATES = ["warm", "cooling", "cold", "warming", "maintenance"] as const;
export type CryostatState = (typeof CRYOSTAT_STATES)[number];
