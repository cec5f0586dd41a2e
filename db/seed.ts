// The demo lab (an invented facility, people and devices): users of all four roles, three
// cryostats, the facility rules, the default procedure templates and four weeks of history,
// written through the same append path as a tablet push. Runs only on an empty database.
import { createHash, randomUUID } from "node:crypto";
import bcrypt from "bcryptjs";
import { count } from "drizzle-orm";
import { he4PressureFromTemperature } from "@/lib/cryo";
import type { CryostatConfig } from "@/lib/schemas/cryostat";
import {
  type EntryInput,
  type EntryKind,
  type PayloadInput,
  parseEntry,
  type SignatureMeaning,
} from "@/lib/schemas/entry";
import type { FacilityRulesValues } from "@/lib/schemas/rules";
import { hmacHex, passwordProofKey, signingMessage } from "@/lib/signing/proof";
import { recordHash } from "@/lib/sync/hash";
import type { Db } from "./client";
import { insertDevice } from "./queries/devices";
import { appendEntries } from "./queries/entries";
import { cryostats, facilityRules, procedureTemplates, type Role, users } from "./schema";
import { DEFAULT_TEMPLATES } from "./seed-templates";

export const DEMO_PASSWORD = "cold-hall-demo";

/** The room's shared tablet the demo history was written on, registered with everyone who wrote on it. */
export const DEMO_TABLET = "demo-tablet-b014";

export const DEMO_USERS: { id: string; email: string; name: string; role: Role }[] = [
  { id: "u-ines", email: "ines@larchmere.example", name: "Ines Vartanian", role: "facility_admin" },
  { id: "u-tomasz", email: "tomasz@larchmere.example", name: "Tomasz Okafor", role: "technician" },
  { id: "u-priya", email: "priya@larchmere.example", name: "Priya Lindqvist", role: "technician" },
  { id: "u-mateo", email: "mateo@larchmere.example", name: "Dr. Mateo Brandt", role: "researcher" },
  { id: "u-yuki", email: "yuki@larchmere.example", name: "Yuki Hallström", role: "researcher" },
  { id: "u-grace", email: "grace@larchmere.example", name: "Dr. Grace Oyelaran", role: "safety_officer" },
];

export const HERON: CryostatConfig = {
  description: "Dry dilution refrigerator, pulse-tube pre-cooled, 9 T solenoid, bottom-loading probe.",
  stages: [
    { key: "pt1", label: "50 K plate", nominalK: 45 },
    { key: "pt2", label: "4 K plate", nominalK: 3.5 },
    { key: "still", label: "Still", nominalK: 0.8 },
    { key: "cold", label: "Cold plate", nominalK: 0.07 },
    { key: "mxc", label: "Mixing chamber", nominalK: 0.012 },
  ],
  magnet: {
    coilConstantTPerA: 0.09,
    maxCurrentA: 100,
    inductanceH: 20,
    rampLimitTPerMin: 0.15,
    persistentSwitch: true,
    dipoleMomentAm2: 2.0e4,
  },
  mixture: { tankVolumeLitres: 40 },
};

export const PLOVER: CryostatConfig = {
  description: "Wet helium-bath cryostat, 14 T magnet, variable-temperature insert (1.5–300 K).",
  stages: [
    { key: "bath", label: "Helium bath", nominalK: 4.2 },
    { key: "vti", label: "VTI sample", nominalK: 1.6 },
  ],
  reservoir: {
    capacityLitres: 90,
    minimumPercent: 25,
    calibration: {
      kind: "table",
      points: [
        { percent: 0, litres: 0 },
        { percent: 10, litres: 8.5 },
        { percent: 90, litres: 88.5 },
        { percent: 100, litres: 90 },
      ],
    },
  },
  magnet: {
    coilConstantTPerA: 0.12,
    maxCurrentA: 120,
    inductanceH: 60,
    rampLimitTPerMin: 0.2,
    persistentSwitch: true,
    dipoleMomentAm2: 3.5e4,
  },
  vapourPressureStage: "vti",
};

export const WREN: CryostatConfig = {
  description: "Helium-4 bath test dewar for quick sensor tests; no magnet.",
  stages: [{ key: "bath", label: "Helium bath", nominalK: 4.2 }],
  reservoir: {
    capacityLitres: 60,
    minimumPercent: 20,
    calibration: { kind: "linear", litresPerPercent: 0.6, offsetLitres: 0 },
  },
};

export const DEMO_RULES: FacilityRulesValues = {
  facilityName: "Low-Temperature Hall B-014, Larchmere Institute for Quantum Matter",
  oxygenAlarmPercent: 19.5,
  oxygenEvacuatePercent: 18,
  twoPersonTransfer: true,
  ppe: ["Face shield", "Cryogenic gloves", "Lab coat with long sleeves", "Closed shoes"],
  minHeliumPercent: { plover: 25, wren: 20 },
  maxRampTPerMin: { heron: 0.15, plover: 0.2 },
  controlledAreaMilliTesla: 0.5,
  controlledAreaNote:
    "The 0.5 mT line around Heron and Plover is marked on the floor. No pacemakers or active implants beyond it; no loose steel tools.",
  forecastWarnDays: 3,
  roomFreeVolumeM3: 220,
  roomAirChangesPerHour: 4,
  contacts: [
    { name: "Dr. Grace Oyelaran", role: "Safety officer", phone: "+00 555 0142" },
    { name: "Institute emergency desk", role: "Emergencies (24 h)", phone: "+00 555 0100" },
    { name: "Ines Vartanian", role: "Facility admin", phone: "+00 555 0177" },
  ],
};

/** Deterministic noise so that the demo looks the same on every machine. */
function rng(seed: number) {
  let a = seed;
  return () => {
    a = (a + 0x6d2b79f5) | 0;
    let t = Math.imul(a ^ (a >>> 15), 1 | a);
    t = (t + Math.imul(t ^ (t >>> 7), 61 | t)) ^ t;
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** One demo entry, its payload typed by its kind as a tablet hands it over (parsed in toEntry). */
type DraftOf<K extends EntryKind> = {
  at: number;
  cryostatId: string | null;
  kind: K;
  payload: PayloadInput<K>;
  author: string;
  runId?: string;
};
type Draft = { [K in EntryKind]: DraftOf<K> }[EntryKind];

const HOUR = 3_600_000;
const DAY = 24 * HOUR;

/** Four weeks of plausible history ending at `now`. */
export function demoHistory(now: number): Draft[] {
  const rand = rng(7);
  const noise = (scale: number) => (rand() - 0.5) * 2 * scale;
  const out: Draft[] = [];
  const push = (d: Draft) => out.push(d);
  const start = now - 28 * DAY;

  // Heron: warmup at day 0–1 (mixture recovered), cooldown from day 7 over ~60 h, cold since.
  push({
    at: start + 2 * HOUR,
    cryostatId: "heron",
    kind: "state",
    payload: { state: "warming", comment: "Warmup for probe rewiring; circulation stopped." },
    author: "u-tomasz",
  });
  push({
    at: start + 3 * HOUR,
    cryostatId: "heron",
    kind: "reading",
    payload: {
      quantity: "Mixture tank pressure",
      value: 812,
      unit: "mbar",
      comment: "All mixture recovered to the tank, 295 K.",
    },
    author: "u-tomasz",
  });
  push({
    at: start + 1.5 * DAY,
    cryostatId: "heron",
    kind: "state",
    payload: { state: "maintenance", comment: "Vented with dry nitrogen at room temperature; probe out." },
    author: "u-tomasz",
  });
  const coolStart = start + 7 * DAY;
  push({
    at: coolStart - 2 * HOUR,
    cryostatId: "heron",
    kind: "reading",
    payload: { quantity: "Mixture tank pressure", value: 806, unit: "mbar", comment: "Before condensing, 295 K." },
    author: "u-priya",
  });
  push({
    at: coolStart,
    cryostatId: "heron",
    kind: "state",
    payload: { state: "cooling", comment: "Pulse tube on after leak check." },
    author: "u-priya",
  });
  const targets: Record<string, { base: number; tau: number; delay: number }> = {
    pt1: { base: 44, tau: 9, delay: 0 },
    pt2: { base: 3.4, tau: 14, delay: 0 },
    still: { base: 0.78, tau: 16, delay: 40 },
    cold: { base: 0.065, tau: 14, delay: 44 },
    mxc: { base: 0.011, tau: 12, delay: 46 },
  };
  for (let h = 0; h <= 72; h += 3) {
    for (const [stage, t] of Object.entries(targets)) {
      const warmTrack = Math.max(t.base, 3.6, 295 * Math.exp(-h / 11) + (stage === "pt1" ? 44 : 3.4));
      const cold = h > t.delay ? t.base + (warmTrack - t.base) * Math.exp(-(h - t.delay) / (t.tau / 6)) : warmTrack;
      const valueK = Math.max(t.base, stage === "pt1" ? 295 * Math.exp(-h / t.tau) + t.base : cold) * (1 + noise(0.02));
      push({
        at: coolStart + h * HOUR,
        cryostatId: "heron",
        kind: "reading",
        payload:
          valueK < 1
            ? { quantity: "Temperature", stage, value: round(valueK * 1000, 2), unit: "mK" }
            : { quantity: "Temperature", stage, value: round(valueK, 3), unit: "K" },
        author: h % 12 < 6 ? "u-tomasz" : "u-priya",
      });
    }
  }
  push({
    at: coolStart + 60 * HOUR,
    cryostatId: "heron",
    kind: "state",
    payload: { state: "cold", comment: "Base temperature reached." },
    author: "u-priya",
  });
  // Cold: a daily base-temperature reading and the magnet ramped for the ring sample.
  for (let d = 10; d < 28; d++) {
    for (const [stage, t] of Object.entries(targets)) {
      const v = t.base * (1 + noise(0.05));
      push({
        at: start + d * DAY + 9 * HOUR,
        cryostatId: "heron",
        kind: "reading",
        payload:
          v < 1
            ? { quantity: "Temperature", stage, value: round(v * 1000, 2), unit: "mK" }
            : { quantity: "Temperature", stage, value: round(v, 3), unit: "K" },
        author: "u-tomasz",
      });
    }
  }
  push({
    at: start + 12 * DAY + 10 * HOUR,
    cryostatId: "heron",
    kind: "field.setting",
    payload: {
      currentA: 0.5,
      fieldT: 0.045,
      persistent: false,
      rampRateTPerMin: 0.01,
      comment: "Ring sample LK-7: field sweep around zero.",
    },
    author: "u-mateo",
  });
  push({
    at: start + 16 * DAY + 10 * HOUR,
    cryostatId: "heron",
    kind: "field.setting",
    payload: {
      currentA: 22.2,
      fieldT: 2.0,
      persistent: true,
      rampRateTPerMin: 0.1,
      comment: "2 T, persistent mode, switch heater off.",
    },
    author: "u-yuki",
  });
  push({
    at: start + 23 * DAY + 10 * HOUR,
    cryostatId: "heron",
    kind: "field.setting",
    payload: {
      currentA: 0,
      fieldT: 0,
      persistent: false,
      rampRateTPerMin: 0.1,
      comment: "Ramped to zero for gate sweeps.",
    },
    author: "u-yuki",
  });

  // Plover: cold all month; ~5 L/day boil-off; transfers twice a week; one quench.
  push({ at: start + HOUR, cryostatId: "plover", kind: "state", payload: { state: "cold" }, author: "u-tomasz" });
  let level = 62;
  let dayOfWeek = 0;
  let transfers = 0;
  for (let d = 0; d < 28; d++) {
    const t0 = start + d * DAY + 8 * HOUR;
    level -= 5.2 + noise(0.6);
    if (d === 19) {
      // Quench at 9.5 T during a ramp: about 30 L lost.
      const before = level;
      level -= 31;
      push({
        at: t0 + 5 * HOUR,
        cryostatId: "plover",
        kind: "quench",
        payload: {
          at: new Date(t0 + 5 * HOUR).toISOString(),
          fieldT: 9.5,
          currentA: 79.2,
          levelBeforePercent: round(before, 1),
          levelAfterPercent: round(level, 1),
          heliumLostLitres: 31,
          oxygenLowestPercent: 20.4,
          actions: "Room cleared until the monitors read above 20.5 %. Magnet power supply off. Recovery line checked.",
        },
        author: "u-priya",
      });
    }
    push({
      at: t0,
      cryostatId: "plover",
      kind: "helium.level",
      payload: { percent: round(level, 1) },
      author: d % 2 ? "u-priya" : "u-tomasz",
    });
    dayOfWeek = d % 7;
    if ((dayOfWeek === 1 || dayOfWeek === 4) && d < 24) {
      // Two transfers a week, topping up to about 90 % (≈ 1 L per % on Plover); none in the last
      // few days, so the boil-off since the last fill has readings to fit.
      const before = level;
      const gained = round(Math.min(88 - before, 50) + noise(1.5), 1);
      const supplied = round(gained / (0.72 + noise(0.06)), 1);
      level = Math.min(92, before + gained);
      transfers += 1;
      // The audit has something to find: the third transfer was done alone, the fifth without
      // an oxygen-monitor reading; at the sixth a visitor watched (listed as one: lib/record/people.ts).
      const single = transfers === 3;
      const noOxygen = transfers === 5;
      const visited = transfers === 6;
      push({
        at: t0 + 2 * HOUR,
        cryostatId: "plover",
        kind: "transfer",
        payload: {
          supplyDewar: d % 3 ? "D-250-A" : "D-250-B",
          peoplePresent: single
            ? ["u-tomasz"]
            : visited
              ? ["u-tomasz", "u-priya", "visitor:Noor Castellanos"]
              : ["u-tomasz", "u-priya"],
          ppeConfirmed: true,
          oxygenMonitorChecked: !noOxygen,
          ...(noOxygen ? {} : { oxygenLowestPercent: round(20.6 + noise(0.2), 1) }),
          levelBeforePercent: round(before, 1),
          levelAfterPercent: round(level, 1),
          pressureBeforeMbar: round(1012 + noise(5), 0),
          pressureAfterMbar: round(1025 + noise(5), 0),
          suppliedLitres: supplied,
          suppliedBy: "level",
          gainedLitres: gained,
          durationMin: round(35 + noise(8), 0),
          anomalies: single
            ? "Second person called away; finished alone."
            : visited
              ? "A service engineer from the level-meter maker watched the transfer."
              : "",
        },
        author: "u-tomasz",
      });
    }
  }
  // Plover's bath and VTI: a morning reading each day; the VTI pressure is what a vapour-pressure
  // thermometer reads (ITS-90 4He scale).
  for (let d = 0; d < 28; d++) {
    const t0 = start + d * DAY + 8 * HOUR + 10 * 60_000;
    const vtiK = 1.55 + noise(0.05);
    push({
      at: t0,
      cryostatId: "plover",
      kind: "reading",
      payload: { quantity: "Temperature", stage: "bath", value: round(4.21 + noise(0.01), 3), unit: "K" },
      author: "u-tomasz",
    });
    push({
      at: t0 + 60_000,
      cryostatId: "plover",
      kind: "reading",
      payload: { quantity: "VTI pressure", value: round(he4PressureFromTemperature(vtiK) / 100, 2), unit: "mbar" },
      author: "u-tomasz",
    });
    push({
      at: t0 + 120_000,
      cryostatId: "plover",
      kind: "reading",
      payload: { quantity: "Temperature", stage: "vti", value: round(vtiK, 3), unit: "K" },
      author: "u-tomasz",
    });
  }
  push({
    at: start + 5 * DAY + 11 * HOUR,
    cryostatId: "plover",
    kind: "field.setting",
    payload: { currentA: 41.7, fieldT: 5.0, persistent: true, rampRateTPerMin: 0.15 },
    author: "u-mateo",
  });
  push({
    at: start + 19 * DAY + 12 * HOUR,
    cryostatId: "plover",
    kind: "field.setting",
    payload: { currentA: 0, fieldT: 0, persistent: false, comment: "After the quench; supply off." },
    author: "u-priya",
  });
  push({
    at: start + 21 * DAY + 11 * HOUR,
    cryostatId: "plover",
    kind: "field.setting",
    payload: { currentA: 25, fieldT: 3.0, persistent: true, rampRateTPerMin: 0.1 },
    author: "u-mateo",
  });

  // Wren: a cold week of sensor tests.
  push({
    at: start + 14 * DAY,
    cryostatId: "wren",
    kind: "state",
    payload: { state: "cold", comment: "Filled for diode calibration runs." },
    author: "u-priya",
  });
  let wren = 88;
  for (let d = 14; d < 28; d++) {
    wren -= 4 + noise(0.5);
    push({
      at: start + d * DAY + 10 * HOUR,
      cryostatId: "wren",
      kind: "helium.level",
      payload: { percent: round(wren, 1) },
      author: "u-priya",
    });
  }
  push({
    at: start + 20 * DAY,
    cryostatId: "wren",
    kind: "note",
    payload: { text: "Diode batch SD-14 mounted; four-wire leads checked at 4.2 K." },
    author: "u-priya",
  });

  // Daily handovers, day shift → evening shift, on Heron and Plover.
  for (let d = 1; d < 28; d++) {
    for (const c of ["heron", "plover"]) {
      push({
        at: start + d * DAY + 15 * HOUR,
        cryostatId: c,
        kind: "handover",
        payload: {
          summary: { openRuns: [], openIssues: [] },
          note: c === "heron" ? "Fridge steady. No alarms." : "Level checked; next transfer as planned.",
          toUserId: "u-priya",
        },
        author: "u-tomasz",
      });
    }
  }
  return out.sort((a, b) => a.at - b.at);
}

function round(x: number, digits: number) {
  const f = 10 ** digits;
  return Math.round(x * f) / f;
}

/** A draft as the entry a push would carry, parsed as a push is (defaults filled, bad demo data refused). */
function toEntry(d: Draft): EntryInput {
  const parsed = parseEntry({
    id: randomUUID(),
    cryostatId: d.cryostatId,
    runId: d.runId ?? null,
    kind: d.kind,
    payload: d.payload,
    authorId: d.author,
    deviceId: DEMO_TABLET,
    recordedAt: new Date(Math.round(d.at)).toISOString(),
    supersedes: null,
    reason: null,
  });
  if (!parsed.ok) throw new Error(`Demo ${d.kind} entry is not valid: ${parsed.problems.join("; ")}`);
  return parsed.entry;
}

/**
 * Signatures: handovers handed over by the author and accepted by the recipient; transfers signed
 * as performed. Each is confirmed the way a person signing online confirms it: with a password
 * proof for exactly that record and meaning (lib/signing/proof.ts), so the server checks it like
 * any other and the auditor sees the identity confirmed.
 */
function withSignatures(list: EntryInput[], passwordHash: string): EntryInput[] {
  const proofKey = passwordProofKey(passwordHash);
  const out: EntryInput[] = [];
  for (const e of list) {
    out.push(e);
    const signers: (readonly [string | undefined, SignatureMeaning, number])[] =
      e.kind === "handover"
        ? [
            [e.authorId, "handed_over", 60_000],
            [e.payload.toUserId, "accepted", 300_000],
          ]
        : e.kind === "transfer"
          ? [[e.authorId, "performed", 120_000]]
          : [];
    for (const [signer, meaning, delay] of signers) {
      const u = DEMO_USERS.find((x) => x.id === signer);
      if (!u) continue;
      out.push(
        toEntry({
          at: Date.parse(e.recordedAt) + delay,
          cryostatId: e.cryostatId,
          kind: "signature",
          author: u.id,
          payload: {
            signedEntryId: e.id,
            meaning,
            signerName: u.name,
            signerRole: u.role,
            signedHash: recordHash(e),
            confirmedBy: "password",
            confirmProof: hmacHex(
              proofKey,
              signingMessage({ signedEntryId: e.id, signedHash: recordHash(e), meaning, signerId: u.id }),
            ),
          },
        }),
      );
    }
  }
  return out;
}

export async function seedIfEmpty(db: Db, now = Date.now()): Promise<boolean> {
  const [{ n } = { n: 0 }] = await db.select({ n: count() }).from(users);
  if (n > 0) return false;
  const passwordHash = await bcrypt.hash(DEMO_PASSWORD, 10);
  await db.insert(users).values(DEMO_USERS.map((u) => ({ ...u, passwordHash })));
  await db.insert(cryostats).values([
    { id: "heron", name: "Heron", kind: "dry_dilution", location: "B-014, bay 1", config: HERON },
    { id: "plover", name: "Plover", kind: "wet_bath", location: "B-014, bay 2", config: PLOVER },
    { id: "wren", name: "Wren", kind: "test_dewar", location: "B-014, bench 3", config: WREN },
  ]);
  await db.insert(facilityRules).values({ version: 1, values: DEMO_RULES, changedBy: "u-ines" });
  if (DEFAULT_TEMPLATES.length) {
    await db
      .insert(procedureTemplates)
      .values(DEFAULT_TEMPLATES.map((t) => ({ ...t, id: randomUUID(), version: 1, createdBy: "u-ines" })));
  }
  const all = withSignatures(demoHistory(now).map(toEntry), passwordHash);
  // The demo tablet is registered (nobody holds its secret: a browser signing in gets its own).
  const writers = DEMO_USERS.map((u) => u.id).filter((id) => all.some((e) => e.authorId === id));
  const [first, ...rest] = writers;
  if (first) {
    const secretHash = createHash("sha256").update(randomUUID()).digest("hex");
    await insertDevice(db, { id: DEMO_TABLET, secretHash, userIds: [first, ...rest], at: new Date(now - 28 * DAY) });
  }
  // Written through the normal append path (checks, hash chain, projections), each entry checked
  // in its author's own role, in batches.
  const authors = new Map(DEMO_USERS.map((u) => [u.id, u]));
  for (let i = 0; i < all.length; i += 500) {
    const res = await appendEntries(db, DEMO_USERS[0]!, all.slice(i, i + 500), { importAuthors: authors });
    if (res.rejected.length) throw new Error(`Demo seed rejected: ${JSON.stringify(res.rejected.slice(0, 3))}`);
  }
  return true;
}
