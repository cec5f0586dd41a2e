// Chart series derived from the demo log (db/queries/series.ts).
import { describe, expect, it } from "vitest";
import { getCryostat } from "@/db/queries/cryostats";
import { buildSeries, cryostatSeries } from "@/db/queries/series";
import { freshDb } from "./fixture";

describe("cryostat series", () => {
  it("Heron: stage temperatures in K over the cooldown, a field history, no reservoir", async () => {
    const db = await freshDb({ seeded: true });
    const heron = (await getCryostat(db, { id: "heron" }))!;
    const s = await cryostatSeries(db, { cryostat: heron });
    expect(s.stages.map((x) => x.key)).toEqual(["pt1", "pt2", "still", "cold", "mxc"]);
    const mxc = s.stages.find((x) => x.key === "mxc")!;
    expect(mxc.points.length).toBeGreaterThan(20);
    // The seed writes the mixing chamber in mK below 1 K: the series is in K.
    const last = mxc.points.at(-1)!;
    expect(last.k).toBeGreaterThan(0.005);
    expect(last.k).toBeLessThan(0.02);
    const first = s.stages.find((x) => x.key === "pt1")!.points[0]!;
    expect(first.k).toBeGreaterThan(200);
    for (const st of s.stages)
      for (let i = 1; i < st.points.length; i++) expect(st.points[i]!.t).toBeGreaterThanOrEqual(st.points[i - 1]!.t);
    expect(s.helium).toBeNull();
    expect(s.fields.map((f) => f.fieldT)).toEqual([0.045, 2, 0]);
    // One cooldown: "cooling" at day 7 to "cold" 60 h later (the seed's story).
    expect(s.cooldowns).toHaveLength(1);
    expect((s.cooldowns[0]!.end! - s.cooldowns[0]!.start) / 3_600_000).toBeCloseTo(60, 6);
  });

  it("Plover: levels with litres from the table calibration, transfers as steps", async () => {
    const db = await freshDb({ seeded: true });
    const plover = (await getCryostat(db, { id: "plover" }))!;
    const s = await cryostatSeries(db, { cryostat: plover });
    expect(s.helium).not.toBeNull();
    const h = s.helium!;
    expect(h.minimumPercent).toBe(25);
    expect(h.transfers.length).toBeGreaterThanOrEqual(4);
    for (const tr of h.transfers) expect(tr.afterPercent).toBeGreaterThan(tr.beforePercent);
    // 50 % → 48.5 L on Plover's table (linear between 10 % = 8.5 L and 90 % = 88.5 L).
    for (const l of h.levels) if (l.percent >= 10 && l.percent <= 90) expect(l.litres).toBeCloseTo(l.percent - 1.5, 9);
  });

  it("a corrected reading replaces the one it supersedes", () => {
    const cfg = { id: "x", config: { stages: [{ key: "mxc", label: "MXC", nominalK: 0.01 }] } };
    const s = buildSeries(cfg, [
      {
        id: "a",
        kind: "reading",
        payload: { stage: "mxc", value: 120, unit: "mK" },
        recordedAt: "2026-01-01T00:00:00.000Z",
        supersedes: null,
      },
      {
        id: "b",
        kind: "reading",
        payload: { stage: "mxc", value: 12, unit: "mK" },
        recordedAt: "2026-01-01T00:05:00.000Z",
        supersedes: "a",
      },
      {
        id: "c",
        kind: "reading",
        payload: { stage: "mxc", value: 3, unit: "mbar" },
        recordedAt: "2026-01-01T00:06:00.000Z",
        supersedes: null,
      },
    ]);
    expect(s.stages[0]!.points.map((p) => p.k)).toEqual([0.012]);
  });
});
