// The sign-in limits in front of next-auth's credentials callback: next-auth's `authorize` can
// only refuse (its answer is always the same error shape), so the count is taken here first and
// a locked account or address is answered 429 with the wait in plain words and Retry-After. The
// shape of the answer is the one next-auth's client `signIn()` reads: `{ url }` with `error=`.
import "server-only";
import { getDb } from "@/db";
import { clientAddress, reserveAttempt, SignInLimited, withReservedAttempt } from "./credentials";

export async function gateCredentialsSignIn(req: Request, run: () => Promise<Response>): Promise<Response> {
  const form = await req
    .clone()
    .formData()
    .catch(() => null);
  const email = String(form?.get("email") ?? "")
    .trim()
    .toLowerCase()
    .slice(0, 200);
  if (!email) return run();
  try {
    const id = await reserveAttempt(await getDb(), { email, address: clientAddress(req.headers) });
    return await withReservedAttempt(id, run);
  } catch (e) {
    if (!(e instanceof SignInLimited)) throw e;
    const url = new URL("/signin", req.url);
    url.searchParams.set("error", e.message);
    return Response.json(
      { url: url.href, error: { code: "rate_limited:signin", message: e.message, details: [], fields: [] } },
      {
        status: 429,
        headers: { "Retry-After": String(Math.ceil(e.waitMs / 1000)), "Cache-Control": "no-store" },
      },
    );
  }
}
