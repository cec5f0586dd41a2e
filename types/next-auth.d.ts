import type { Role } from "@/lib/schemas/user";

declare module "next-auth" {
  interface User {
    id: string;
    role: Role;
    name: string;
    email: string;
    sessionVersion: number;
  }
  interface Session {
    user: { id: string; name: string; email: string; role: Role };
    sv: number;
  }
}

declare module "next-auth/jwt" {
  interface JWT {
    uid: string;
    role: Role;
    sv: number;
  }
}
