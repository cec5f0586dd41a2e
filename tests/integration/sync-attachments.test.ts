// Attachments: upload by the tablet's id (idempotent), type by magic bytes, size bound,
// same-origin only, served as a download; and the sync client uploads photos before entries.

import { randomUUID } from "node:crypto";
import { readdirSync } from "node:fs";
import { afterAll, beforeEach, describe, expect, it, vi } from "vitest";
import type { Db } from "@/db/client";
import { AppError } from "@/lib/errors";
import { putAttachmentIn, recordEntriesIn } from "@/lib/local/store";
import type { SessionUser } from "@/lib/schemas/user";
import { syncOnce } from "@/lib/sync/client";
import type { Transport } from "@/lib/sync/transport";
import { sniffType } from "@/server/storage/objects";
import { testDirs } from "../support/dirs";
import { noteDraft } from "../support/entries";
import { nothingNew, signedInTablet } from "../support/tablet";
import { tomasz } from "../support/users";
import { freshDb } from "./fixture";

const dirs = testDirs("rimelog-files-");
const dir = dirs.storageDir;
process.env.RIMELOG_STORAGE_DIR = dir;
afterAll(() => dirs.remove());

const state: { db?: Db; user: SessionUser | null } = { user: null };
vi.mock("@/db", () => ({ getDb: async () => state.db }));
vi.mock("@/server/auth/require", () => ({
  requireSession: async () => {
    if (!state.user) throw new AppError("unauthorized", "session", "Sign in first.");
    return { user: state.user, sessionId: "s-test" };
  },
}));
const upload = (await import("@/app/api/attachments/route")).POST;
const download = (await import("@/app/api/attachments/[id]/route")).GET;

const JPEG = new Uint8Array([0xff, 0xd8, 0xff, 0xe0, 0, 0x10, 0x4a, 0x46, 0x49, 0x46, 0, 1]);
const ORIGIN = "http://localhost:3000";

function post(bytes: Uint8Array, id: string, headers: Record<string, string> = {}) {
  return upload(
    new Request(`${ORIGIN}/api/attachments`, {
      method: "POST",
      body: bytes as unknown as BodyInit,
      headers: {
        "content-type": "application/octet-stream",
        origin: ORIGIN,
        host: "localhost:3000",
        "x-rimelog-attachment-id": id,
        "x-rimelog-file-name": encodeURIComponent("../../gauge 1.jpg"),
        ...headers,
      },
    }),
  );
}

beforeEach(async () => {
  state.db = await freshDb({ seeded: true });
  state.user = tomasz;
});

describe("attachments", () => {
  it("types files by their bytes, not their names", () => {
    expect(sniffType(JPEG)?.mime).toBe("image/jpeg");
    expect(sniffType(new TextEncoder().encode("%PDF-1.7\n"))?.mime).toBe("application/pdf");
    expect(sniffType(new TextEncoder().encode("T(K),R(Ohm)\n1.5,1200\n"))?.mime).toMatch(/^text\/plain/);
    expect(sniffType(new Uint8Array([0x4d, 0x5a, 0x90, 0, 3]))).toBeNull(); // an executable
  });

  it("stores under a server-made name, answers a retry the same, serves it as a download", async () => {
    const id = randomUUID();
    const first = await post(JPEG, id);
    expect(first.status).toBe(201);
    const again = await post(JPEG, id);
    expect(again.status).toBe(200);
    const files = readdirSync(dir, { recursive: true }).map(String);
    expect(files.some((f) => f.includes("gauge"))).toBe(false);
    const res = await download(new Request(`${ORIGIN}/api/attachments/${id}`), { params: Promise.resolve({ id }) });
    expect(res.status).toBe(200);
    expect(res.headers.get("content-type")).toBe("image/jpeg");
    expect(res.headers.get("content-disposition")).toMatch(/^attachment; filename="gauge 1.jpg"/);
    expect(res.headers.get("x-content-type-options")).toBe("nosniff");
    expect(new Uint8Array(await res.arrayBuffer())).toEqual(JPEG);
  });

  it("refuses other types (415), cross-origin (403), other bytes under a used id (409), signed-out (401)", async () => {
    expect((await post(new Uint8Array([0x4d, 0x5a, 0x90, 0, 3]), randomUUID())).status).toBe(415);
    expect((await post(JPEG, randomUUID(), { origin: "http://evil.example" })).status).toBe(403);
    const id = randomUUID();
    await post(JPEG, id);
    expect((await post(new Uint8Array([...JPEG, 1]), id)).status).toBe(409);
    state.user = null;
    expect((await post(JPEG, randomUUID())).status).toBe(401);
  });

  it("the sync client uploads a photo before pushing the entry that refers to it", async () => {
    const tablet = await signedInTablet(tomasz, "t-photo");
    const photoId = await putAttachmentIn(tablet, new Blob([JPEG]), { fileName: "gauge.jpg", mime: "image/jpeg" });
    await recordEntriesIn(tablet, [noteDraft(`photo ${photoId}`)]);
    const calls: string[] = [];
    const transport: Transport = {
      upload: async (a) => {
        calls.push(`upload ${a.id}`);
        return { id: a.id, bytes: a.blob.size, mime: a.mime, sha256: "" };
      },
      push: async (list) => {
        calls.push("push");
        return {
          accepted: list.map((e, i) => ({
            id: e.id,
            seq: 10_000 + i,
            hash: "h".repeat(64),
            prevHash: "p".repeat(64),
            receivedAt: new Date().toISOString(),
          })),
          rejected: [],
        };
      },
      pull: nothingNew(tomasz),
    };
    await syncOnce(tablet, transport);
    expect(calls).toEqual([`upload ${photoId}`, "push"]);
    expect((await tablet.attachments.get(photoId))?.state).toBe("uploaded");
  });
});
