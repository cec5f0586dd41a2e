// The demo lab's people as the tests use them: the accounts db/seed.ts seeds (DEMO_USERS), one
// password for all. Written out here (not imported from db/seed.ts) so that browser tests and
// tablet tests can use them without loading the server's database code;
// tests/unit/test-support.test.ts checks that they are the seeded accounts.
import type { SessionUser } from "@/lib/schemas/user";

export const DEMO_PASSWORD = "cold-hall-demo";

export const ines: SessionUser = {
  id: "u-ines",
  email: "ines@larchmere.example",
  name: "Ines Vartanian",
  role: "facility_admin",
};
export const tomasz: SessionUser = {
  id: "u-tomasz",
  email: "tomasz@larchmere.example",
  name: "Tomasz Okafor",
  role: "technician",
};
export const priya: SessionUser = {
  id: "u-priya",
  email: "priya@larchmere.example",
  name: "Priya Lindqvist",
  role: "technician",
};
export const mateo: SessionUser = {
  id: "u-mateo",
  email: "mateo@larchmere.example",
  name: "Dr. Mateo Brandt",
  role: "researcher",
};
export const yuki: SessionUser = {
  id: "u-yuki",
  email: "yuki@larchmere.example",
  name: "Yuki Hallström",
  role: "researcher",
};
export const grace: SessionUser = {
  id: "u-grace",
  email: "grace@larchmere.example",
  name: "Dr. Grace Oyelaran",
  role: "safety_officer",
};

/** Everyone, by first name, in the seed's order. */
export const PEOPLE = { ines, tomasz, priya, mateo, yuki, grace } as const;
export type Person = keyof typeof PEOPLE;
