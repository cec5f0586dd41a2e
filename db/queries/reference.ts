// The reference data a tablet keeps for offline use — cryostats, procedure templates (every
// version), the facility rules in force (with the rules document's metadata), the sensor
// calibration tables in force, the people this user may see — and its hash, so an unchanged copy
// is not sent again. The pull (app/api/sync/pull) sends it; the tablet stores it in Dexie.
import { asc } from "drizzle-orm";
import type { Db } from "@/db/client";
import { procedureTemplates } from "@/db/schema";
import { canonicalJson, sha256Hex } from "@/lib/sync/hash";
import type { ReferenceData } from "@/lib/sync/protocol";
import { listCalibrations } from "./calibrations";
import { listCryostats } from "./cryostats";
import { getRules } from "./rules";
import { listPublicUsers } from "./users";

type Row = { id: string } & Record<string, unknown>;
/** As the wire carries it (dates as ISO strings), so the hash is the hash of what is sent. */
const plain = <T>(value: T): T => JSON.parse(JSON.stringify(value)) as T;

export async function loadReference(db: Db): Promise<ReferenceData> {
  const [cryostats, templates, rules, calibrations, users] = await Promise.all([
    listCryostats(db),
    // Every version: a run pins the version it started from.
    db.select().from(procedureTemplates).orderBy(asc(procedureTemplates.key), asc(procedureTemplates.version)),
    getRules(db),
    // The newest accepted table per cryostat and stage: what the reading forms convert with.
    listCalibrations(db, { inForce: true }),
    listPublicUsers(db),
  ]);
  const body = {
    cryostats: plain(cryostats) as unknown as Row[],
    templates: plain(templates) as unknown as Row[],
    rules: rules ? plain(rules) : null,
    calibrations: plain(calibrations),
    users: plain(users) as unknown as Row[],
  };
  return { ...body, hash: sha256Hex(canonicalJson(body)) };
}
