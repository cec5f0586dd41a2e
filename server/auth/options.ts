// next-auth configuration: credentials sign-in (bcrypt), JWT sessions carrying id, role and the
// user's session version. The session lasts one long shift so a tablet can work offline through it.
import "server-only";
import type { NextAuthOptions } from "next-auth";
import CredentialsProvider from "next-auth/providers/credentials";
import { z } from "zod";
import { getDb } from "@/db";
import { getUser } from "@/db/queries/users";
import { verifySignIn } from "./credentials";

/** How long a signed-in tablet keeps working without seeing the server again. */
export const SESSION_MAX_AGE_S = 14 * 60 * 60;

const credentialsSchema = z.object({ email: z.string().email().max(200), password: z.string().min(1).max(200) });

export const authOptions: NextAuthOptions = {
  secret: process.env.AUTH_SECRET ?? process.env.NEXTAUTH_SECRET,
  session: { strategy: "jwt", maxAge: SESSION_MAX_AGE_S },
  pages: { signIn: "/signin" },
  providers: [
    CredentialsProvider({
      name: "Rimelog",
      credentials: { email: { label: "Email", type: "email" }, password: { label: "Password", type: "password" } },
      async authorize(raw) {
        const parsed = credentialsSchema.safeParse(raw);
        if (!parsed.success) throw new Error("Enter your email address and password.");
        const user = await verifySignIn(await getDb(), parsed.data);
        const row = await getUser(await getDb(), { id: user.id });
        return { ...user, sessionVersion: row?.sessionVersion ?? 1 };
      },
    }),
  ],
  callbacks: {
    async jwt({ token, user }) {
      if (user) {
        token.uid = user.id;
        token.role = user.role;
        token.name = user.name;
        token.email = user.email;
        token.sv = user.sessionVersion;
      }
      return token;
    },
    async session({ session, token }) {
      session.user = { id: token.uid, name: token.name ?? "", email: token.email ?? "", role: token.role };
      session.sv = token.sv;
      return session;
    },
  },
};
