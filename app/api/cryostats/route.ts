// The room overview: every cryostat with its state and latest figures.
import { roomOverview } from "@/db/queries/cryostats";
import { json } from "@/server/http/respond";
import { route } from "@/server/http/route";

export const dynamic = "force-dynamic";

export const GET = route({ access: "signed-in", surface: "cryostat" }, async ({ db }) =>
  json({ cryostats: await roomOverview(db) }),
);
