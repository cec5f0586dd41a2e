// The demo lab's accounts as the browser tests sign in with them: the people of
// tests/support/users.ts (the accounts db/seed.ts seeds), one password for all, and a pattern
// for each display name.
import type { Role } from "@/lib/schemas/user";
import { DEMO_PASSWORD, grace, ines, mateo, priya, tomasz, yuki } from "../../support/users";

export { DEMO_PASSWORD };

export interface DemoUser {
  email: string;
  role: Role;
  /** A part of the display name that every rendering of it contains (titles like "Dr." vary). */
  nameMatch: RegExp;
}

export const DEMO_USERS = {
  ines: { email: ines.email, role: ines.role, nameMatch: /Ines Vartanian/ },
  tomasz: { email: tomasz.email, role: tomasz.role, nameMatch: /Tomasz Okafor/ },
  priya: { email: priya.email, role: priya.role, nameMatch: /Priya Lindqvist/ },
  mateo: { email: mateo.email, role: mateo.role, nameMatch: /Mateo Brandt/ },
  yuki: { email: yuki.email, role: yuki.role, nameMatch: /Yuki Hallstr(ö|o)m/ },
  grace: { email: grace.email, role: grace.role, nameMatch: /Grace Oyelaran/ },
} as const satisfies Record<string, DemoUser>;

export const CRYOSTATS = ["Heron", "Plover", "Wren"] as const;
