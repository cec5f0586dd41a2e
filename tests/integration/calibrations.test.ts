// Accepting sensor calibration tables (db/queries/calibrations.ts): re-parsed on the server,
// newest per stage in force, bad files refused with the line that is wrong.
import { describe, expect, it } from "vitest";
import { acceptCalibration, listCalibrations } from "@/db/queries/calibrations";
import { convertReading } from "@/lib/cryo";
import { AppError } from "@/lib/errors";
import { calibrationUploadSchema } from "@/lib/schemas/calibration";
import { freshDb } from "./fixture";

const TABLE = "# T(K) R(Ohm)\nT R\n0.01 20000\n0.1 5000\n1 2000\n4.2 1200\n";

const upload = (over: Record<string, unknown> = {}) =>
  calibrationUploadSchema.parse({
    cryostatId: "heron",
    stage: "mxc",
    sensorKind: "ruthenium-oxide",
    sensorLabel: "RX-102 #A4411",
    fileName: "rx-a4411.txt",
    text: TABLE,
    ...over,
  });

describe("calibrations", () => {
  it("stores the parsed table; the stored table converts a reading like the parser's own", async () => {
    const db = await freshDb({ seeded: true });
    const rec = await acceptCalibration(db, { upload: upload(), userId: "u-tomasz" });
    expect(rec.table.points).toHaveLength(4);
    expect(rec.acceptedByName).toBe("Tomasz Okafor");
    const [listed] = await listCalibrations(db, { cryostatId: "heron" });
    expect(listed?.id).toBe(rec.id);
    // A node of the table converts to its own temperature after the JSON round trip.
    expect(convertReading(listed!.table, 5000)).toBeCloseTo(0.1, 10);
  });

  it("the newest table per stage is in force; history keeps both", async () => {
    const db = await freshDb({ seeded: true });
    await acceptCalibration(db, { upload: upload(), userId: "u-tomasz" });
    await new Promise((r) => setTimeout(r, 5));
    const second = await acceptCalibration(db, {
      upload: upload({ sensorLabel: "RX-102 #B0001", text: "0.02 15000\n0.2 4000\n2 1500\n" }),
      userId: "u-ines",
    });
    await acceptCalibration(db, { upload: upload({ stage: "still" }), userId: "u-tomasz" });
    const inForce = await listCalibrations(db, { cryostatId: "heron" });
    expect(inForce.map((c) => c.stage).sort()).toEqual(["mxc", "still"]);
    expect(inForce.find((c) => c.stage === "mxc")?.id).toBe(second.id);
    expect(await listCalibrations(db, { cryostatId: "heron", inForce: false })).toHaveLength(3);
    expect(await listCalibrations(db, { cryostatId: "plover" })).toHaveLength(0);
  });

  it("refuses a table that turns back, naming the line, and stores nothing", async () => {
    const db = await freshDb({ seeded: true });
    const bad = upload({ text: "0.01 20000\n0.1 5000\n1 6000\n" });
    await expect(acceptCalibration(db, { upload: bad, userId: "u-tomasz" })).rejects.toThrow(/Line 3/);
    await expect(acceptCalibration(db, { upload: bad, userId: "u-tomasz" })).rejects.toBeInstanceOf(AppError);
    expect(await listCalibrations(db, {})).toHaveLength(0);
  });

  it("refuses a stage the cryostat does not have", async () => {
    const db = await freshDb({ seeded: true });
    await expect(acceptCalibration(db, { upload: upload({ stage: "vti" }), userId: "u-tomasz" })).rejects.toThrow(
      /no stage "vti"/,
    );
  });

  it("the upload schema refuses an empty file and a missing sensor name", () => {
    expect(calibrationUploadSchema.safeParse({ ...upload(), text: "" }).success).toBe(false);
    expect(calibrationUploadSchema.safeParse({ ...upload(), sensorLabel: "  " }).success).toBe(false);
  });
});
