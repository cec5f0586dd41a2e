// Role and access changes: the session version moves on and the change is on the audit trail.
import { describe, expect, it } from "vitest";
import { chainEntries } from "@/db/queries/entries";
import { changeUserAccess, getUser } from "@/db/queries/users";
import { ines } from "../support/users";
import { freshDb } from "./fixture";

describe("changeUserAccess", () => {
  it("changes the role, ends sessions and writes a user.change entry", async () => {
    const db = await freshDb({ seeded: true });
    const before = await getUser(db, { id: "u-yuki" });
    const res = await changeUserAccess(db, ines, {
      id: "u-yuki",
      change: { role: "technician", active: false },
      deviceId: "server",
    });
    expect(res.ok).toBe(true);
    const after = await getUser(db, { id: "u-yuki" });
    expect(after?.role).toBe("technician");
    expect(after?.active).toBe(false);
    expect(after!.sessionVersion).toBe(before!.sessionVersion + 1);
    const trail = (await chainEntries(db, "facility")).filter((e) => e.kind === "user.change");
    expect(trail).toHaveLength(1);
    expect(trail[0]!.payload).toMatchObject({
      userId: "u-yuki",
      changes: [
        { field: "role", from: "researcher", to: "technician" },
        { field: "active", from: true, to: false },
      ],
    });
    expect(trail[0]!.authorId).toBe("u-ines");
  });

  it("refuses a change to oneself and a change that changes nothing, writing nothing", async () => {
    const db = await freshDb({ seeded: true });
    expect(await changeUserAccess(db, ines, { id: "u-ines", change: { active: false }, deviceId: "server" })).toEqual({
      ok: false,
      reason: "self",
    });
    expect(
      await changeUserAccess(db, ines, { id: "u-mateo", change: { role: "researcher" }, deviceId: "server" }),
    ).toEqual({ ok: false, reason: "no_change" });
    expect(await changeUserAccess(db, ines, { id: "u-nobody", change: { active: false }, deviceId: "server" })).toEqual(
      { ok: false, reason: "not_found" },
    );
    expect((await chainEntries(db, "facility")).filter((e) => e.kind === "user.change")).toHaveLength(0);
  });
});

describe("refused PIN proofs", () => {
  it("are counted per person", async () => {
    const { recordRejectedPinProof, rejectedPinProofs } = await import("@/db/queries/users");
    const db = await freshDb({ seeded: true });
    const now = new Date("2026-12-01T06:00:00Z");
    await recordRejectedPinProof(db, { userId: "u-tomasz", entryId: null, now });
    await recordRejectedPinProof(db, { userId: "u-tomasz", entryId: null, now });
    await recordRejectedPinProof(db, { userId: "u-priya", entryId: null, now });
    expect(await rejectedPinProofs(db, { userId: "u-tomasz", since: new Date(now.getTime() - 60_000) })).toBe(2);
    expect(await rejectedPinProofs(db, { userId: "u-tomasz", since: now })).toBe(0);
  });
});
