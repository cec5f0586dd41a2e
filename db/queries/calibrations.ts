// Accepted sensor calibration tables: storing one after it was parsed and previewed, and listing
// the table in force per stage (the newest accepted for that cryostat and stage).
import { randomUUID } from "node:crypto";
import { and, desc, eq } from "drizzle-orm";
import type { Db } from "@/db/client";
import { type CalibrationRow, calibrations, cryostats, users } from "@/db/schema";
import { type CalibrationTable, CryoInputError, parseCalibration } from "@/lib/cryo";
import { AppError } from "@/lib/errors";
import type { CalibrationRecord, CalibrationUpload } from "@/lib/schemas/calibration";

export type { CalibrationRecord };

function toRecord(row: CalibrationRow, name: string | null): CalibrationRecord {
  return {
    id: row.id,
    cryostatId: row.cryostatId,
    stage: row.stage,
    sensorKind: row.sensorKind as CalibrationTable["sensorKind"],
    sensorLabel: row.sensorLabel,
    attachmentId: row.attachmentId,
    fileName: row.fileName,
    table: row.table,
    acceptedBy: row.acceptedBy,
    acceptedByName: name ?? row.acceptedBy,
    acceptedAt: row.acceptedAt.toISOString(),
  };
}

/** Parse the file again (never trust the preview) and store it as the stage's table in force. */
export async function acceptCalibration(
  db: Db,
  { upload, userId }: { upload: CalibrationUpload; userId: string },
): Promise<CalibrationRecord> {
  const [cryostat] = await db.select().from(cryostats).where(eq(cryostats.id, upload.cryostatId));
  if (!cryostat) throw new AppError("not_found", "cryostat", `No cryostat "${upload.cryostatId}".`);
  if (!cryostat.config.stages.some((s) => s.key === upload.stage)) {
    throw new AppError("bad_request", "calibration", `${cryostat.name} has no stage "${upload.stage}".`);
  }
  let table: CalibrationTable;
  try {
    table = parseCalibration(upload.text, {
      sensorKind: upload.sensorKind,
      ...(upload.columns ? { columns: upload.columns } : {}),
    });
  } catch (e) {
    if (e instanceof CryoInputError || e instanceof RangeError)
      throw new AppError("bad_request", "calibration", e.message);
    throw e;
  }
  const [row] = await db
    .insert(calibrations)
    .values({
      id: randomUUID(),
      cryostatId: upload.cryostatId,
      stage: upload.stage,
      sensorKind: upload.sensorKind,
      sensorLabel: upload.sensorLabel,
      attachmentId: upload.attachmentId ?? null,
      fileName: upload.fileName,
      sourceText: upload.text,
      table,
      acceptedBy: userId,
    })
    .returning();
  const [u] = await db.select({ name: users.name }).from(users).where(eq(users.id, userId));
  return toRecord(row!, u?.name ?? null);
}

/** Every accepted table of a cryostat (or all), newest first; `inForce` keeps the newest per stage. */
export async function listCalibrations(
  db: Db,
  { cryostatId, inForce = true }: { cryostatId?: string; inForce?: boolean },
): Promise<CalibrationRecord[]> {
  const rows = await db
    .select({ row: calibrations, name: users.name })
    .from(calibrations)
    .leftJoin(users, eq(users.id, calibrations.acceptedBy))
    .where(cryostatId ? and(eq(calibrations.cryostatId, cryostatId)) : undefined)
    .orderBy(desc(calibrations.acceptedAt), desc(calibrations.id));
  const seen = new Set<string>();
  const out: CalibrationRecord[] = [];
  for (const { row, name } of rows) {
    const key = `${row.cryostatId}\u0000${row.stage}`;
    if (inForce && seen.has(key)) continue;
    seen.add(key);
    out.push(toRecord(row, name));
  }
  return out;
}
