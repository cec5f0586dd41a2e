// Sensor calibration tables: GET the tables in force (any signed-in user; the tablet remembers
// them for offline conversion), POST to accept a previewed table (facility admin or technician).
import { z } from "zod";
import { getDb } from "@/db";
import { acceptCalibration, listCalibrations } from "@/db/queries/calibrations";
import { AppError } from "@/lib/errors";
import { calibrationUploadSchema } from "@/lib/schemas/calibration";
import { formatIssues } from "@/lib/schemas/entry";
import { requireUser } from "@/server/auth/require";
import { handle, json, readJson } from "@/server/http/respond";

export const dynamic = "force-dynamic";

const query = z.object({ cryostatId: z.string().min(1).max(60).optional(), history: z.enum(["0", "1"]).default("0") });

export async function GET(req: Request) {
  return handle(async () => {
    await requireUser();
    const q = query.safeParse(Object.fromEntries(new URL(req.url).searchParams));
    if (!q.success)
      throw new AppError("bad_request", "calibration", "Unknown query parameters.", formatIssues(q.error));
    const calibrations = await listCalibrations(await getDb(), {
      ...(q.data.cryostatId ? { cryostatId: q.data.cryostatId } : {}),
      inForce: q.data.history === "0",
    });
    return json({ calibrations });
  });
}

export async function POST(req: Request) {
  return handle(async () => {
    const user = await requireUser("facility_admin", "technician");
    const body = calibrationUploadSchema.safeParse(await readJson(req, 400_000));
    if (!body.success)
      throw new AppError(
        "bad_request",
        "calibration",
        "The calibration upload is incomplete.",
        formatIssues(body.error),
      );
    const record = await acceptCalibration(await getDb(), { upload: body.data, userId: user.id });
    return json({ calibration: record }, 201);
  });
}
