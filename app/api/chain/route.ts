// Chain check for the auditor: every chain (cryostats and the facility chain) verified now;
// POST signs the chain heads at once (otherwise the server does it at intervals).
import { getDb } from "@/db";
import { checkChain, listChains, signChainHeads } from "@/db/queries/chain";
import { checkpointKeys } from "@/server/audit/keys";
import { requireUser } from "@/server/auth/require";
import { handle, json, readJson } from "@/server/http/respond";

export const dynamic = "force-dynamic";

export async function GET(req: Request) {
  return handle(async () => {
    await requireUser("safety_officer", "facility_admin");
    const db = await getDb();
    const only = new URL(req.url).searchParams.get("chain");
    const chains = (await listChains(db)).filter((c) => !only || c.chain === only);
    const reports = [];
    for (const c of chains) reports.push(await checkChain(db, { chain: c.chain, keys: checkpointKeys() }));
    return json({ reports });
  });
}

export async function POST(req: Request) {
  return handle(async () => {
    await requireUser("safety_officer", "facility_admin");
    await readJson(req, 1000);
    const signed = await signChainHeads(await getDb(), { keys: checkpointKeys() });
    return json({ signed: signed.map((c) => ({ chain: c.chain, seq: c.seq, signedAt: c.signedAt })) });
  });
}
