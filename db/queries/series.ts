// Chart series of one cryostat from the server's log (the building itself is lib/series.ts).
import { and, asc, eq, inArray } from "drizzle-orm";
import type { Db } from "@/db/client";
import { type Cryostat, entries } from "@/db/schema";
import { buildSeries, type CryostatSeries, SERIES_KINDS, type SeriesEntry } from "@/lib/series";

export { buildSeries, type CryostatSeries, SERIES_KINDS, type SeriesEntry };

/** The chart series of a cryostat from the server's log. */
export async function cryostatSeries(
  db: Db,
  { cryostat }: { cryostat: Pick<Cryostat, "id" | "config"> },
): Promise<CryostatSeries> {
  const rows = await db
    .select({
      id: entries.id,
      kind: entries.kind,
      payload: entries.payload,
      recordedAt: entries.recordedAt,
      supersedes: entries.supersedes,
    })
    .from(entries)
    .where(and(eq(entries.cryostatId, cryostat.id), inArray(entries.kind, [...SERIES_KINDS])))
    .orderBy(asc(entries.recordedAt));
  return buildSeries(cryostat, rows);
}
