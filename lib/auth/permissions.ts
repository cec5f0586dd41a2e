// Who may do what. One table of permissions, used by every route handler, server action and push.

import type { EntryKind, SignatureMeaning } from "@/lib/schemas/entry";
import type { Role } from "@/lib/schemas/user";

export type { Role };
export const ALL_ROLES: readonly Role[] = ["technician", "researcher", "safety_officer", "facility_admin"];

export const ROLE_LABEL: Record<Role, string> = {
  technician: "Technician",
  researcher: "Researcher",
  safety_officer: "Safety officer",
  facility_admin: "Facility admin",
};

const FIELD_ROLES: readonly Role[] = ["technician", "researcher", "safety_officer", "facility_admin"];

/** Which roles may write each entry kind. */
export const WRITE_KINDS: Record<EntryKind, readonly Role[]> = {
  note: FIELD_ROLES,
  reading: FIELD_ROLES,
  "helium.level": FIELD_ROLES,
  "field.setting": ["technician", "researcher", "facility_admin"],
  state: ["technician", "researcher", "facility_admin"],
  handover: ["technician", "researcher"],
  transfer: ["technician", "researcher", "safety_officer"],
  quench: FIELD_ROLES,
  incident: FIELD_ROLES,
  signature: FIELD_ROLES,
  "audit.finding": ["safety_officer"],
  // Procedure runs: the people who run the fridge, and the safety officer for hold points.
  "run.start": ["technician", "researcher"],
  "run.step": ["technician", "researcher", "safety_officer", "facility_admin"],
  "run.abort": ["technician", "researcher", "facility_admin"],
  "run.complete": ["technician", "researcher"],
  "rules.change": ["facility_admin"],
  "user.change": ["facility_admin"],
};

/** Which roles may read each entry kind (anything not listed: everyone signed in). */
const READ_RESTRICTED: Partial<Record<EntryKind, readonly Role[]>> = {
  "audit.finding": ["safety_officer", "facility_admin"],
};

/** Which roles may sign with each meaning. */
export const SIGN_MEANINGS: Record<SignatureMeaning, readonly Role[]> = {
  performed: ["technician", "researcher"],
  verified: ["technician", "researcher", "safety_officer", "facility_admin"],
  handed_over: ["technician", "researcher"],
  accepted: ["technician", "researcher"],
  audited: ["safety_officer"],
};

export function mayWrite(role: Role, kind: EntryKind): boolean {
  return WRITE_KINDS[kind].includes(role);
}

export function mayRead(role: Role, kind: string): boolean {
  const allowed = READ_RESTRICTED[kind as EntryKind];
  return !allowed || allowed.includes(role);
}

export function readableKindsExcluded(role: Role): string[] {
  return Object.entries(READ_RESTRICTED)
    .filter(([, roles]) => !roles.includes(role))
    .map(([kind]) => kind);
}

export function maySign(role: Role, meaning: SignatureMeaning): boolean {
  return SIGN_MEANINGS[meaning].includes(role);
}
