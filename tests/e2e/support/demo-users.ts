// The demo lab's accounts as the app seeds them (db/seed.ts DEMO_USERS, listed in README.md); one
// password for all.
export const DEMO_PASSWORD = "cold-hall-demo";

export type Role = "facility_admin" | "technician" | "researcher" | "safety_officer";

export interface DemoUser {
  email: string;
  role: Role;
  /** A part of the display name that every rendering of it contains (titles like "Dr." vary). */
  nameMatch: RegExp;
}

export const DEMO_USERS = {
  ines: { email: "ines@larchmere.example", role: "facility_admin", nameMatch: /Ines Vartanian/ },
  tomasz: { email: "tomasz@larchmere.example", role: "technician", nameMatch: /Tomasz Okafor/ },
  priya: { email: "priya@larchmere.example", role: "technician", nameMatch: /Priya Lindqvist/ },
  mateo: { email: "mateo@larchmere.example", role: "researcher", nameMatch: /Mateo Brandt/ },
  yuki: { email: "yuki@larchmere.example", role: "researcher", nameMatch: /Yuki Hallstr(ö|o)m/ },
  grace: { email: "grace@larchmere.example", role: "safety_officer", nameMatch: /Grace Oyelaran/ },
} as const satisfies Record<string, DemoUser>;

export const CRYOSTATS = ["Heron", "Plover", "Wren"] as const;
