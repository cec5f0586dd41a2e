// The request that accepts a sensor calibration table for one thermometer channel (cryostat +
// stage). One zod schema for the upload page and the route handler; the file's text travels
// with it and is parsed again on the server with the same lib/cryo parser the preview used.
import { z } from "zod";
import type { CalibrationTable, SensorKind } from "@/lib/cryo";

export const SENSOR_KIND_VALUES = ["ruthenium-oxide", "germanium", "silicon-diode", "carbon"] as const;

/** Sensor kinds in plain words, with the quantity the table maps to temperature. */
export const SENSOR_KIND_LABEL: Record<SensorKind, string> = {
  "ruthenium-oxide": "Ruthenium oxide (Ω)",
  germanium: "Germanium (Ω)",
  carbon: "Carbon (Ω)",
  "silicon-diode": "Silicon diode (V)",
};

/** How the two columns of a calibration file are read; "auto" looks at the header line. */
export const COLUMN_ORDER_OPTIONS = [
  { value: "auto", label: "From the header (else temperature first)" },
  { value: "temperature-value", label: "Temperature, then value" },
  { value: "value-temperature", label: "Value, then temperature" },
] as const;

/** A calibration file is a small text table; anything bigger is not one. */
export const MAX_CALIBRATION_BYTES = 200_000;

export const calibrationUploadSchema = z.object({
  cryostatId: z.string().min(1).max(60),
  stage: z.string().min(1).max(40),
  sensorKind: z.enum(SENSOR_KIND_VALUES),
  sensorLabel: z.string().trim().min(1, "Give the sensor's name or serial number").max(120),
  columns: z.enum(["temperature-value", "value-temperature"]).optional(),
  fileName: z.string().trim().min(1).max(200),
  text: z
    .string()
    .min(1, "The file is empty")
    .max(MAX_CALIBRATION_BYTES, "The file is over 200 kB: not a calibration table"),
  /** The stored file, when the storage layer took it first. */
  attachmentId: z.uuid().optional(),
});
export type CalibrationUpload = z.infer<typeof calibrationUploadSchema>;

/** An accepted calibration table as the server lists it. */
export interface CalibrationRecord {
  id: string;
  cryostatId: string;
  stage: string;
  sensorKind: CalibrationTable["sensorKind"];
  sensorLabel: string;
  attachmentId: string | null;
  fileName: string;
  table: CalibrationTable;
  acceptedBy: string;
  acceptedByName: string;
  acceptedAt: string;
}
