import type { Role } from "@/lib/schemas/user";

declare module "next-auth" {
  interface User {
    id: string;
    role: Role;
    name: string;
    email: string;
    sessionVersion: number;
    mustChangePassword: boolean;
  }
  interface Session {
    user: { id: string; name: string; email: string; role: Role };
    /** The server-side session's id (sessions table). */
    sid: string;
    sv: number;
  }
}

declare module "next-auth/jwt" {
  interface JWT {
    uid: string;
    role: Role;
    sv: number;
    /** The server-side session's id. */
    sid: string;
    /** The session's absolute expiry, seconds since the epoch: the token never lives past it. */
    aexp: number;
    /** Must change the password before anything else (an admin reset). */
    mc?: boolean;
  }
}
