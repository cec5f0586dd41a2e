// Chain check for the auditor: every chain (cryostats and the facility chain) verified now;
// POST signs the chain heads at once (otherwise the server does it at intervals).
import { z } from "zod";
import { checkChain, listChains, signChainHeads } from "@/db/queries/chain";
import { checkpointKeys } from "@/server/audit/keys";
import { json } from "@/server/http/respond";
import { route } from "@/server/http/route";

export const dynamic = "force-dynamic";

const AUDITORS = ["safety_officer", "facility_admin"] as const;

export const GET = route(
  { access: AUDITORS, surface: "chain", query: z.object({ chain: z.string().optional() }) },
  async ({ db, query }) => {
    const chains = (await listChains(db)).filter((c) => !query.chain || c.chain === query.chain);
    const reports = [];
    for (const c of chains) reports.push(await checkChain(db, { chain: c.chain, keys: checkpointKeys() }));
    return json({ reports });
  },
);

export const POST = route({ access: AUDITORS, surface: "chain", body: "json", maxBytes: 1000 }, async ({ db }) => {
  const signed = await signChainHeads(db, { keys: checkpointKeys() });
  return json({ signed: signed.map((c) => ({ chain: c.chain, seq: c.seq, signedAt: c.signedAt })) });
});
