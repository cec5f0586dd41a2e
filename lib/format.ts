// Display formatting shared by every screen: temperatures in the unit a fridge person reads,
// times in the room's local time, entry kinds in plain words.
import type { CryostatState } from "@/lib/schemas/cryostat";
import type { EntryKind, SignatureMeaning } from "@/lib/schemas/entry";

/** A label from a map with one entry per known key; a key the map lacks (or an inherited one) gives undefined. */
function labelIn(map: Readonly<Record<string, string>>, key: string): string | undefined {
  return Object.hasOwn(map, key) ? map[key] : undefined;
}

export function formatTemperature(value: number, unit: string): string {
  const k = unit === "mK" ? value / 1000 : value;
  if (unit !== "K" && unit !== "mK") return `${trim(value)} ${unit}`;
  if (k < 1) return `${trim(k * 1000)} mK`;
  return `${trim(k)} K`;
}

/** Three significant figures, no trailing noise. */
export function trim(x: number, digits = 3): string {
  if (!Number.isFinite(x)) return "—";
  if (x === 0) return "0";
  const abs = Math.abs(x);
  if (abs >= 1000) return Math.round(x).toLocaleString("en-GB");
  return Number(x.toPrecision(digits)).toString();
}

export function formatWhen(iso: string, now = Date.now()): string {
  const t = Date.parse(iso);
  const mins = Math.round((now - t) / 60_000);
  if (mins < 1) return "just now";
  if (mins < 60) return `${mins} min ago`;
  const hours = Math.round(mins / 60);
  if (hours < 24) return `${hours} h ago`;
  const days = Math.round(hours / 24);
  if (days < 14) return `${days} d ago`;
  return formatDate(iso);
}

// One formatter for every call: toLocaleString builds a new one each time, which costs
// milliseconds per logbook row on a tablet.
const DATE_TIME = new Intl.DateTimeFormat("en-GB", {
  day: "2-digit",
  month: "short",
  year: "numeric",
  hour: "2-digit",
  minute: "2-digit",
});

export function formatDate(iso: string): string {
  return DATE_TIME.format(new Date(iso));
}

const KIND_LABEL: Record<EntryKind, string> = {
  note: "Note",
  reading: "Reading",
  "helium.level": "Helium level",
  "field.setting": "Field setting",
  state: "State change",
  handover: "Shift handover",
  transfer: "Helium transfer",
  quench: "Quench",
  incident: "Incident",
  signature: "Signature",
  "audit.finding": "Audit finding",
  "run.start": "Procedure started",
  "run.step": "Procedure step",
  "run.abort": "Procedure aborted",
  "run.complete": "Procedure completed",
  "rules.change": "Facility rules changed",
  "user.change": "Access changed",
};

export function kindLabel(kind: string): string {
  return labelIn(KIND_LABEL, kind) ?? kind.replace(/[._]/g, " ").replace(/^\w/, (c) => c.toUpperCase());
}

const STATE_LABEL: Record<CryostatState, string> = {
  warm: "Warm",
  cooling: "Cooling down",
  cold: "Cold",
  warming: "Warming up",
  maintenance: "Open for work",
};
export function stateLabel(state: string | null): string {
  return state ? (labelIn(STATE_LABEL, state) ?? state) : "No state recorded";
}

const MEANING_LABEL: Record<SignatureMeaning, string> = {
  performed: "Performed",
  verified: "Verified",
  handed_over: "Handed over",
  accepted: "Accepted",
  audited: "Audited",
};
export function meaningLabel(meaning: string): string {
  return labelIn(MEANING_LABEL, meaning) ?? meaning;
}
