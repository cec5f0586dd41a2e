// next-auth's own routes (sign-in, session, sign-out, CSRF). A credentials sign-in first passes
// the limits per account and per address (server/auth/sign-in-gate.ts: 429 with the wait).
import NextAuth from "next-auth";
import { authOptions } from "@/server/auth/options";
import { gateCredentialsSignIn } from "@/server/auth/sign-in-gate";

type Ctx = { params: Promise<{ nextauth: string[] }> };

const handler = NextAuth(authOptions) as (req: Request, ctx: Ctx) => Promise<Response>;

export async function POST(req: Request, ctx: Ctx): Promise<Response> {
  const [action, provider] = (await ctx.params).nextauth ?? [];
  if (action === "callback" && provider === "credentials") return gateCredentialsSignIn(req, () => handler(req, ctx));
  return handler(req, ctx);
}

export { handler as GET };
