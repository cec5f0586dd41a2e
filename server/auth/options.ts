// next-auth configuration: credentials sign-in (bcrypt, with the limits of ./credentials.ts) and
// JWT sessions that carry a server-side session's id (./sessions.ts). Every read of the session
// checks that row; sign-out ends it; the token's expiry never moves past the session's absolute
// expiry, however often `GET /api/auth/session` refreshes it.
import "server-only";
import type { NextAuthOptions } from "next-auth";
import { encode } from "next-auth/jwt";
import CredentialsProvider from "next-auth/providers/credentials";
import { z } from "zod";
import { getDb } from "@/db";
import { clientAddress, verifySignIn } from "./credentials";
import { closeSession, liveSession, openSession, sessionLifetimeS } from "./sessions";

/** How long a session lasts at most (one long shift, RIMELOG_SESSION_HOURS: 14 h by default). */
export const SESSION_MAX_AGE_S = sessionLifetimeS();

const credentialsSchema = z.object({ email: z.string().email().max(200), password: z.string().min(1).max(200) });

/** Thrown by the jwt callback for an ended or expired session: next-auth then clears the cookie. */
export class SessionEnded extends Error {
  override name = "SessionEnded";
}

export const authOptions: NextAuthOptions = {
  secret: process.env.AUTH_SECRET ?? process.env.NEXTAUTH_SECRET,
  session: { strategy: "jwt", maxAge: SESSION_MAX_AGE_S },
  pages: { signIn: "/signin" },
  jwt: {
    // next-auth gives every token it writes a fresh `maxAge`; cap it at the session's absolute expiry.
    async encode(params) {
      const aexp = params.token?.aexp;
      const left = typeof aexp === "number" ? aexp - Math.floor(Date.now() / 1000) : undefined;
      const maxAge = left === undefined ? params.maxAge : Math.min(params.maxAge ?? SESSION_MAX_AGE_S, left);
      return encode({ ...params, ...(maxAge === undefined ? {} : { maxAge }) });
    },
  },
  providers: [
    CredentialsProvider({
      name: "Rimelog",
      credentials: { email: { label: "Email", type: "email" }, password: { label: "Password", type: "password" } },
      async authorize(raw, req) {
        const parsed = credentialsSchema.safeParse(raw);
        if (!parsed.success) throw new Error("Enter your email address and password.");
        return verifySignIn(await getDb(), { ...parsed.data, address: clientAddress(req?.headers ?? {}) });
      },
    }),
  ],
  callbacks: {
    async jwt({ token, user }) {
      const db = await getDb();
      if (user) {
        const session = await openSession(db, { userId: user.id });
        token.uid = user.id;
        token.sid = session.id;
        token.aexp = Math.floor(session.expiresAt.getTime() / 1000);
        token.sv = user.sessionVersion;
        token.role = user.role;
        token.name = user.name;
        token.email = user.email;
        token.mc = user.mustChangePassword;
        return token;
      }
      const live = await liveSession(db, { id: token.sid, sessionVersion: token.sv });
      if (!live) throw new SessionEnded("This session has ended: sign in again.");
      token.role = live.user.role;
      token.name = live.user.name;
      token.email = live.user.email;
      token.mc = live.mustChangePassword;
      return token;
    },
    async session({ session, token }) {
      session.user = { id: token.uid, name: token.name ?? "", email: token.email ?? "", role: token.role };
      session.sid = token.sid;
      session.sv = token.sv;
      return session;
    },
  },
  events: {
    async signOut({ token }) {
      await closeSession(await getDb(), token?.sid);
    },
  },
  logger: {
    // An ended or expired session is an ordinary sign-out, not an error worth a stack trace.
    error(code, meta) {
      const err = meta instanceof Error ? meta : (meta as { error?: unknown } | undefined)?.error;
      if (code === "JWT_SESSION_ERROR" && err instanceof Error && ["SessionEnded", "JWTExpired"].includes(err.name))
        return;
      console.error(`[next-auth][error][${code}]`, meta);
    },
    warn(code) {
      console.warn(`[next-auth][warn][${code}]`);
    },
    debug() {},
  },
};
