// The reference data a tablet keeps for offline use, through the real pull route into the tablet
// store: the rules in force (with the document's metadata), the calibration tables in force and
// the templates arrive with the first pull and again only when they change; a server from before
// calibrations were part of it still works; a store left by schema v4 is upgraded and fetches the
// whole reference again; another person's session and a sign-out take the tables away; the chart
// series built on the tablet from its log are the server's own.
import { randomUUID } from "node:crypto";
import Dexie from "dexie";
import { IDBFactory, IDBKeyRange } from "fake-indexeddb";
import { beforeEach, describe, expect, it, vi } from "vitest";
import type { Db } from "@/db/client";
import { acceptCalibration, listCalibrations } from "@/db/queries/calibrations";
import { getCryostat } from "@/db/queries/cryostats";
import { loadReference } from "@/db/queries/reference";
import { getRules } from "@/db/queries/rules";
import { cryostatSeries } from "@/db/queries/series";
import { devices } from "@/db/schema";
import { AppError } from "@/lib/errors";
import { RimelogDexie, SCHEMA_VERSIONS } from "@/lib/local/db";
import { calibrationsOf, seriesOf } from "@/lib/local/queries";
import { clearLocalData } from "@/lib/local/session";
import { confirmSession, recordEntriesIn } from "@/lib/local/store";
import { calibrationUploadSchema } from "@/lib/schemas/calibration";
import type { SessionUser } from "@/lib/schemas/user";
import { syncOnce } from "@/lib/sync/client";
import { canonicalJson, sha256Hex } from "@/lib/sync/hash";
import type { PullReply } from "@/lib/sync/protocol";
import { applyPull } from "@/lib/sync/pull";
import type { Transport } from "@/lib/sync/transport";
import { applyPush } from "@/server/sync/apply";
import { inProcessRegister } from "../support/tablet";
import { freshDb } from "./fixture";

const state: { db?: Db; user: SessionUser | null } = { user: null };
vi.mock("@/db", () => ({ getDb: async () => state.db }));
vi.mock("@/server/tick", () => ({ ensureServerTick: () => undefined, kickServerTick: () => undefined }));
vi.mock("@/server/auth/require", () => ({
  requireSession: async () => {
    if (!state.user) throw new AppError("unauthorized", "session", "Sign in first.");
    return { user: state.user, sessionId: "s-test" };
  },
}));
const { GET } = await import("@/app/api/sync/pull/route");

const tomasz: SessionUser = {
  id: "u-tomasz",
  email: "tomasz@larchmere.example",
  name: "Tomasz Okafor",
  role: "technician",
};
const priya: SessionUser = {
  id: "u-priya",
  email: "priya@larchmere.example",
  name: "Priya Lindqvist",
  role: "technician",
};
const ORIGIN = "http://localhost:3000";

const TABLE = "# T(K) R(Ohm)\nT R\n0.01 20000\n0.1 5000\n1 2000\n4.2 1200\n";
const upload = (over: Record<string, unknown> = {}) =>
  calibrationUploadSchema.parse({
    cryostatId: "heron",
    stage: "mxc",
    sensorKind: "ruthenium-oxide",
    sensorLabel: "RX-102 #A4411",
    fileName: "rx-a4411.txt",
    text: TABLE,
    ...over,
  });

let factory: IDBFactory;
beforeEach(async () => {
  state.db = await freshDb({ seeded: true });
  state.user = tomasz;
  factory = new IDBFactory();
});

const tablet = (name = "t") => new RimelogDexie(name, { indexedDB: factory, IDBKeyRange });

/** The tablet's side over the real pull route (JSON on the wire); pushes applied in process. */
function server(opts: { dropCalibrations?: boolean } = {}) {
  const pulls: PullReply[] = [];
  const transport: Transport = {
    register: inProcessRegister(
      () => state.db!,
      () => state.user!,
    ),
    async push(list) {
      return JSON.parse(JSON.stringify(await applyPush(state.db!, state.user!, { entries: list })));
    },
    async pull(since, refHash) {
      const q = new URLSearchParams({ since: String(since) });
      if (refHash !== null) q.set("ref", opts.dropCalibrations ? "none" : refHash);
      const res = await GET(new Request(`${ORIGIN}/api/sync/pull?${q}`));
      expect(res.status).toBe(200);
      const reply = (await res.json()) as PullReply;
      if (opts.dropCalibrations && reply.reference) {
        // As a server from before calibrations were part of the reference answers: no tables, its
        // hash over the rest only, and no reference when the tablet's hash is that one.
        const { hash: _hash, calibrations: _calibrations, ...rest } = reply.reference;
        const hash = sha256Hex(canonicalJson(rest));
        reply.reference = hash === refHash ? null : { ...rest, hash };
      }
      pulls.push(reply);
      return reply;
    },
  };
  return { transport, pulls };
}

const wire = <T>(x: T): T => JSON.parse(JSON.stringify(x)) as T;

describe("reference data on the tablet", () => {
  it("brings the rules in force, the calibration tables in force and the templates, and again only when they change", async () => {
    const db = state.db!;
    await acceptCalibration(db, { upload: upload(), userId: "u-tomasz" });
    await acceptCalibration(db, { upload: upload({ stage: "still", sensorLabel: "RX-202 #C7" }), userId: "u-tomasz" });
    const t = tablet();
    const { transport, pulls } = server();
    await syncOnce(t, transport);

    expect(pulls[0]!.reference).not.toBeNull();
    expect(await t.getMeta("rules")).toEqual(wire(await getRules(db)));
    expect((await t.getMeta("rules"))?.values.oxygenAlarmPercent).toBe(19.5);
    expect(await calibrationsOf(t, "heron")).toEqual(wire(await listCalibrations(db, { cryostatId: "heron" })));
    expect((await calibrationsOf(t, "heron")).map((c) => c.stage).sort()).toEqual(["mxc", "still"]);
    expect(await calibrationsOf(t, "plover")).toEqual([]);
    expect(await t.templates.count()).toBeGreaterThan(0);

    // Nothing changed: the next round's pull sends no reference.
    const before = pulls.length;
    await syncOnce(t, transport);
    expect(pulls.slice(before).every((p) => p.reference === null)).toBe(true);

    // A new table for the mixing chamber replaces the one in force there on the next round.
    await new Promise((r) => setTimeout(r, 5));
    const newer = await acceptCalibration(db, {
      upload: upload({ sensorLabel: "RX-102 #B0001", text: "0.02 15000\n0.2 4000\n2 1500\n" }),
      userId: "u-ines",
    });
    const hashBefore = await t.getMeta("refHash");
    await syncOnce(t, transport);
    expect(await t.getMeta("refHash")).not.toBe(hashBefore);
    const held = await calibrationsOf(t, "heron");
    expect(held.map((c) => c.stage).sort()).toEqual(["mxc", "still"]);
    expect(held.find((c) => c.stage === "mxc")?.id).toBe(newer.id);
    expect(held[0]?.id).toBe(newer.id); // newest first
  });

  it("the hash covers the calibrations: accepting a table changes it", async () => {
    const db = state.db!;
    const before = await loadReference(db);
    expect(before.calibrations).toEqual([]);
    await acceptCalibration(db, { upload: upload(), userId: "u-tomasz" });
    const after = await loadReference(db);
    expect(after.calibrations).toHaveLength(1);
    expect(after.hash).not.toBe(before.hash);
  });

  it("works with a server that sends no calibrations: the rest is kept, no tables are", async () => {
    await acceptCalibration(state.db!, { upload: upload(), userId: "u-tomasz" });
    const t = tablet();
    const old = server({ dropCalibrations: true });
    await syncOnce(t, old.transport);
    expect(old.pulls[0]!.reference).not.toBeNull();
    expect(await t.getMeta("rules")).toEqual(wire(await getRules(state.db!)));
    expect(await t.cryostats.count()).toBeGreaterThan(0);
    expect(await t.calibrations.count()).toBe(0);
    expect(await t.getMeta("refHash")).toMatch(/^[0-9a-f]{64}$/);
    // That server sees the tablet's copy as current.
    await syncOnce(t, old.transport);
    expect(old.pulls.at(-1)!.reference).toBeNull();

    // The same tablet on an upgraded server gets the tables (the hash differs).
    await syncOnce(t, server().transport);
    expect(await t.calibrations.count()).toBe(1);
  });

  it("upgrades a store left by schema v4: its data stays, and the next pull brings the whole reference again", async () => {
    await acceptCalibration(state.db!, { upload: upload(), userId: "u-tomasz" });
    const ref = wire(await loadReference(state.db!));
    const old = new Dexie("upgrade", { indexedDB: factory, IDBKeyRange });
    for (const [version, stores] of SCHEMA_VERSIONS.filter(([v]) => v <= 4)) old.version(version).stores(stores);
    await old.table("cryostats").bulkPut(ref.cryostats);
    await old.table("templates").bulkPut(ref.templates);
    await old.table("users").bulkPut(ref.users);
    const note = {
      id: randomUUID(),
      cryostatId: "wren",
      runId: null,
      kind: "note",
      payload: { text: "written before the update" },
      authorId: tomasz.id,
      deviceId: "tab-old",
      recordedAt: new Date().toISOString(),
      supersedes: null,
      reason: null,
    };
    await old
      .table("entries")
      .add({ ...note, sync: "pending", seq: null, hash: null, prevHash: null, receivedAt: null, rejection: null });
    await old
      .table("outbox")
      .add({ entryId: note.id, authorId: tomasz.id, queuedAt: note.recordedAt, bytes: 300, entry: note });
    // Its device id reached the server with an earlier push, before tablets registered (kept
    // without a secret); Tomasz adopts it at the first round.
    await state.db!.insert(devices).values({ id: "tab-old", userId: tomasz.id });
    await old.table("meta").bulkPut([
      { key: "deviceId", value: "tab-old" },
      { key: "session", value: { user: tomasz, confirmedAt: new Date().toISOString() } },
      { key: "rules", value: ref.rules },
      // A hash the v4 app could have kept: it must not stop the tables from coming.
      { key: "refHash", value: ref.hash },
    ]);
    old.close();

    const t = tablet("upgrade");
    expect(await t.getMeta("refHash")).toBeUndefined();
    expect(await t.calibrations.count()).toBe(0);
    expect(await t.cryostats.count()).toBe(ref.cryostats.length);
    expect(await t.getMeta("rules")).toEqual(ref.rules);
    expect((await t.entries.get(note.id))?.sync).toBe("pending");

    const { transport, pulls } = server();
    await syncOnce(t, transport);
    expect(pulls[0]!.reference).not.toBeNull();
    expect(await calibrationsOf(t, "heron")).toEqual(wire(await listCalibrations(state.db!, { cryostatId: "heron" })));
    expect((await t.entries.get(note.id))?.sync).toBe("synced");
  });

  it("another person's session and a sign-out take the tables away", async () => {
    await acceptCalibration(state.db!, { upload: upload(), userId: "u-tomasz" });
    const t = tablet();
    await syncOnce(t, server().transport);
    expect(await t.calibrations.count()).toBe(1);

    // Priya signs in on the same tablet: the previous view goes before hers is pulled.
    const forgotten = await applyPull(
      t,
      { entries: [], cursor: 0, hasMore: false, reference: null, me: priya },
      () => new Date(),
    );
    expect(forgotten.restart).toBe(true);
    expect(await t.calibrations.count()).toBe(0);

    state.user = priya;
    await syncOnce(t, server().transport);
    expect(await t.calibrations.count()).toBe(1);
    await clearLocalData(t);
    expect(await t.calibrations.count()).toBe(0);
    expect(await t.getMeta("rules")).toBeUndefined();
  });
});

describe("chart series built on the tablet", () => {
  it("are the server's own after a pull, show an unsent entry at once and leave a refused one out", async () => {
    const t = tablet();
    await syncOnce(t, server().transport);
    const heron = (await getCryostat(state.db!, { id: "heron" }))!;
    const onServer = await cryostatSeries(state.db!, { cryostat: heron });
    const onTablet = await seriesOf(t, "heron", undefined, onServer.generatedAt);
    expect(onServer.stages.some((s) => s.points.length > 0)).toBe(true);
    expect(onTablet).toEqual(wire(onServer));

    // A mixing-chamber reading saved on the tablet and not yet sent is on the chart at once.
    await confirmSession(t, tomasz);
    const [saved] = await recordEntriesIn(t, [
      {
        cryostatId: "heron",
        kind: "reading",
        payload: { quantity: "Mixing chamber", stage: "mxc", value: 8.5, unit: "mK" },
      },
    ]);
    const withUnsent = (await seriesOf(t, "heron"))!;
    const mxc = (s: typeof withUnsent) => s.stages.find((x) => x.key === "mxc")!.points;
    expect(mxc(withUnsent)).toContainEqual({ t: Date.parse(saved!.recordedAt), k: 0.0085 });
    expect(mxc(withUnsent)).toHaveLength(mxc(onTablet!).length + 1);

    // Refused by the server: no longer on the chart.
    await t.entries.update(saved!.id, { sync: "rejected" });
    expect(mxc((await seriesOf(t, "heron"))!)).toEqual(mxc(onTablet!));

    // Only the kinds asked for are read; a cryostat the tablet does not hold has no series.
    const levelsOnly = (await seriesOf(t, "heron", ["helium.level", "transfer", "quench", "field.setting"]))!;
    expect(levelsOnly.stages.every((s) => s.points.length === 0)).toBe(true);
    expect(levelsOnly.fields).toEqual(onTablet!.fields);
    expect(await seriesOf(t, "nowhere")).toBeNull();
  });
});
