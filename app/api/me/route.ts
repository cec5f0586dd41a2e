import { requireUser } from "@/lib/auth/require";
import { handle, json } from "@/lib/http/respond";

export const dynamic = "force-dynamic";

export async function GET() {
  return handle(async () => json({ user: await requireUser() }));
}
