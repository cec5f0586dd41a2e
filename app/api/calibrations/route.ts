// Sensor calibration tables: GET the tables in force (any signed-in user; the tablet remembers
// them for offline conversion), POST to accept a previewed table (facility admin or technician).
import { z } from "zod";
import { acceptCalibration, listCalibrations } from "@/db/queries/calibrations";
import { calibrationUploadSchema } from "@/lib/schemas/calibration";
import { json } from "@/server/http/respond";
import { route } from "@/server/http/route";

export const dynamic = "force-dynamic";

const query = z.object({ cryostatId: z.string().min(1).max(60).optional(), history: z.enum(["0", "1"]).default("0") });

export const GET = route(
  { access: "signed-in", surface: "calibration", query, invalid: "Unknown query parameters." },
  async ({ db, query: q }) => {
    const calibrations = await listCalibrations(db, {
      ...(q.cryostatId ? { cryostatId: q.cryostatId } : {}),
      inForce: q.history === "0",
    });
    return json({ calibrations });
  },
);

export const POST = route(
  {
    access: ["facility_admin", "technician"],
    surface: "calibration",
    body: calibrationUploadSchema,
    maxBytes: 400_000,
    invalid: "The calibration upload is incomplete.",
  },
  async ({ db, user, body }) =>
    json({ calibration: await acceptCalibration(db, { upload: body, userId: user.id }) }, 201),
);
