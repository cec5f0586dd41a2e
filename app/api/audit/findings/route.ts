// The officer's finding and its `audited` signature, written together (online), as ordinary log
// entries through the one append path (server/audit/findings.ts).
import { z } from "zod";
import { recordFinding } from "@/server/audit/findings";
import { json } from "@/server/http/respond";
import { route } from "@/server/http/route";

export const dynamic = "force-dynamic";

const bodySchema = z.object({ finding: z.unknown(), signature: z.unknown() });

export const POST = route(
  {
    access: ["safety_officer"],
    surface: "audit",
    body: bodySchema,
    maxBytes: 600_000,
    invalid: "Send the finding and its signature.",
  },
  async ({ db, user, body }) => json({ accepted: await recordFinding(db, user, body) }, 201),
);
