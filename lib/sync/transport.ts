// How the sync client talks to the server, whatever carries it: the browser's fetch
// (lib/sync/http.ts) or, in the reliability tests, a lossy in-process server. Failures come back
// as one of the few kinds the sync acts on.
import type { DeviceRegistered, DeviceRegistration } from "@/lib/schemas/device";
import type { EntryInput } from "@/lib/schemas/entry";
import type { PullReply, PushReply, UploadReply } from "./protocol";

export type TransportErrorKind = "offline" | "unauthorized" | "too_large" | "bad_request" | "forbidden" | "server";

export class TransportError extends Error {
  constructor(
    public readonly kind: TransportErrorKind,
    message: string,
    public readonly status?: number,
    public readonly code?: string,
  ) {
    super(message);
    this.name = "TransportError";
  }
}

export interface Transport {
  /**
   * Optional: the request body for a push, made ahead. The sync client calls it for the next
   * batch while the previous push travels, and hands the result back to `push`.
   */
  encodePush?(entries: EntryInput[]): unknown;
  push(entries: EntryInput[], encoded?: unknown): Promise<PushReply>;
  pull(since: number, refHash: string | null): Promise<PullReply>;
  upload?(a: { id: string; blob: Blob; fileName: string; mime: string }): Promise<UploadReply>;
  /**
   * Register this tablet for the signed-in user (POST /api/devices). A transport without it never
   * registers: the round pushes under whatever registration the store already holds.
   */
  register?(r: DeviceRegistration): Promise<DeviceRegistered>;
}
