// Readiness, public: 200 once the database is open, migrated and seeded (the wrapper opens it).
import { json } from "@/server/http/respond";
import { route } from "@/server/http/route";

export const dynamic = "force-dynamic";

export const GET = route({ access: "public", surface: "health" }, async () => json({ ok: true }));
