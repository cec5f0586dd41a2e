// The reference data a tablet keeps for offline use (cryostats, procedure templates, facility
// rules, the people this user may see) and its hash, so an unchanged copy is not sent again.
import { asc } from "drizzle-orm";
import type { Db } from "@/db/client";
import { listCryostats } from "@/db/queries/cryostats";
import { getRules } from "@/db/queries/rules";
import { listPublicUsers } from "@/db/queries/users";
import { procedureTemplates } from "@/db/schema";
import { canonicalJson, sha256Hex } from "@/lib/sync/hash";
import type { ReferenceData } from "@/lib/sync/protocol";

type Row = { id: string } & Record<string, unknown>;
const plain = <T>(rows: T[]): Row[] => JSON.parse(JSON.stringify(rows)) as Row[];

export async function loadReference(db: Db): Promise<ReferenceData> {
  const [cryostats, templates, rules, users] = await Promise.all([
    listCryostats(db),
    // Every version: a run pins the version it started from.
    db.select().from(procedureTemplates).orderBy(asc(procedureTemplates.key), asc(procedureTemplates.version)),
    getRules(db),
    listPublicUsers(db),
  ]);
  const body = {
    cryostats: plain(cryostats),
    templates: plain(templates),
    rules: rules ? (JSON.parse(JSON.stringify(rules)) as Record<string, unknown>) : null,
    users: plain(users),
  };
  return { ...body, hash: sha256Hex(canonicalJson(body)) };
}
