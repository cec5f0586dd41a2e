import { getDb } from "@/db";
import { handle, json } from "@/server/http/respond";

export const dynamic = "force-dynamic";

/** Readiness: 200 once the database is open, migrated and seeded. */
export async function GET() {
  return handle(async () => {
    await getDb();
    return json({ ok: true });
  });
}
