// The room overview derived from the demo log.
import { describe, expect, it } from "vitest";
import { roomOverview } from "@/db/queries/cryostats";
import { listCryostatEntries } from "@/db/queries/entries";
import { freshDb } from "./fixture";

describe("room overview", () => {
  it("derives each cryostat's state, stages, helium, field and shift from the log", async () => {
    const db = await freshDb({ seeded: true });
    const room = await roomOverview(db);
    expect(room.map((c) => c.name)).toEqual(["Heron", "Plover", "Wren"]);
    const [heron, plover, wren] = room;
    expect(heron!.state).toBe("cold");
    expect(heron!.stages.map((s) => s.stage)).toEqual(["pt1", "pt2", "still", "cold", "mxc"]);
    const mxc = heron!.stages.find((s) => s.stage === "mxc")!;
    expect(mxc.unit).toBe("mK");
    expect(mxc.value).toBeGreaterThan(5);
    expect(mxc.value).toBeLessThan(20);
    expect(heron!.field?.fieldT).toBe(0);
    expect(plover!.helium?.percent).toBeGreaterThan(0);
    expect(plover!.onShift?.name).toBe("Priya Lindqvist");
    expect(wren!.field).toBeNull();
    expect(wren!.lastEntry).not.toBeNull();
  });

  it("gives the audit something to find: one transfer done alone, one without an oxygen reading", async () => {
    const { demoHistory } = await import("@/db/seed");
    const transfers = demoHistory(Date.parse("2026-11-30T12:00:00Z")).filter((d) => d.kind === "transfer");
    expect(transfers.length).toBeGreaterThanOrEqual(6);
    expect(transfers.filter((t) => (t.payload.peoplePresent as string[]).length === 1)).toHaveLength(1);
    expect(transfers.filter((t) => t.payload.oxygenMonitorChecked === false)).toHaveLength(1);
  });

  it("leaves enough level readings after Plover's last fill for a boil-off fit (at least 3)", async () => {
    const { demoHistory } = await import("@/db/seed");
    const plover = demoHistory(Date.parse("2026-11-30T12:00:00Z")).filter((d) => d.cryostatId === "plover");
    const lastFill = Math.max(...plover.filter((d) => d.kind === "transfer").map((d) => d.at));
    expect(plover.filter((d) => d.kind === "helium.level" && d.at > lastFill).length).toBeGreaterThanOrEqual(3);
  });

  it("pages a logbook newest first without gaps or repeats", async () => {
    const db = await freshDb({ seeded: true });
    const seen: number[] = [];
    let cursor: number | undefined;
    for (;;) {
      const page = await listCryostatEntries(db, { cryostatId: "plover", role: "technician", cursor, limit: 40 });
      seen.push(...page.entries.map((e) => e.seq));
      if (!page.nextCursor) break;
      cursor = page.nextCursor;
    }
    expect(seen.length).toBeGreaterThan(40);
    expect([...seen].sort((a, b) => b - a)).toEqual(seen);
    expect(new Set(seen).size).toBe(seen.length);
  });
});
