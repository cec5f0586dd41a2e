"use client";
// The one way screens talk to the app's own API when they are online-only (admin screens, audit
// views, exports, uploads, PIN and password checks): a typed body back, or an `ApiError` carrying
// the server's `error.code`, `message`, `details` and `fields`. What the tablet needs offline is not
// fetched here: it comes through the sync's pull into the tablet store (lib/local/hooks.ts). The
// sync's own transport is lib/sync/http.ts.
import { useCallback, useEffect, useRef, useState } from "react";

/** One input the server refused, by its path in the request body ("values.ppe.0"). */
export type FieldProblem = { path: string; message: string };

/** `status` 0: no answer reached the page (no network, server down, timed out). */
export class ApiError extends Error {
  constructor(
    readonly status: number,
    /** The server's `error.code` (`type:surface`), or "offline" / "bad_answer" from this side. */
    readonly code: string,
    message: string,
    readonly details: readonly string[] = [],
    readonly fields: readonly FieldProblem[] = [],
  ) {
    super(message);
    this.name = "ApiError";
  }

  get offline(): boolean {
    return this.status === 0;
  }

  /** The message with the server's list of problems after it, as one paragraph. */
  get text(): string {
    return [this.message, ...problemList(this)].join(" ");
  }
}

export const NO_CONNECTION = "No connection to the server.";

/**
 * What to show for a failed call: `offlineText` when no answer came (the screen's own words, e.g.
 * "nothing was changed"), else the server's message (and its details with `withDetails`).
 */
export function problemText(e: unknown, offlineText = NO_CONNECTION, withDetails = false): string {
  if (e instanceof ApiError) return e.offline ? offlineText : withDetails ? e.text : e.message;
  return e instanceof Error ? e.message : String(e);
}

/**
 * The server's list of problems for a failed call, to show under its message: the details, or
 * (from a server that only names the inputs) each refused input as "path: message".
 */
export function problemList(e: unknown): string[] {
  if (!(e instanceof ApiError)) return [];
  if (e.details.length) return [...e.details];
  return e.fields.map((f) => (f.path ? `${f.path}: ${f.message}` : f.message));
}

export type ApiInit = {
  method?: "GET" | "POST" | "PUT" | "PATCH" | "DELETE";
  /** A JSON body (sent as application/json). */
  json?: unknown;
  /** Raw bytes (a file): sent as they are, application/octet-stream unless `headers` says otherwise. */
  body?: Blob | ArrayBuffer;
  headers?: Record<string, string>;
  signal?: AbortSignal;
};

const strings = (x: unknown): string[] => (Array.isArray(x) ? x.filter((s): s is string => typeof s === "string") : []);

const fieldsOf = (x: unknown): FieldProblem[] =>
  Array.isArray(x)
    ? x.flatMap((f) => {
        const { path, message } = (f ?? {}) as { path?: unknown; message?: unknown };
        return typeof message === "string" ? [{ path: typeof path === "string" ? path : "", message }] : [];
      })
    : [];

/** Call the API: the parsed body of a 2xx answer, else throws `ApiError`. Never cached. */
export async function api<T>(url: string, init: ApiInit = {}): Promise<T> {
  const headers: Record<string, string> = { ...init.headers };
  let body: BodyInit | undefined;
  if (init.json !== undefined) {
    headers["content-type"] ??= "application/json";
    body = JSON.stringify(init.json);
  } else if (init.body !== undefined) {
    headers["content-type"] ??= "application/octet-stream";
    body = init.body;
  }
  let res: Response;
  try {
    res = await fetch(url, {
      method: init.method ?? (body === undefined ? "GET" : "POST"),
      headers,
      body,
      cache: "no-store",
      credentials: "same-origin",
      ...(init.signal ? { signal: init.signal } : {}),
    });
  } catch (e) {
    if (init.signal?.aborted) throw e;
    throw new ApiError(0, "offline", NO_CONNECTION);
  }
  let parsed: unknown;
  let readable = true;
  try {
    parsed = await res.json();
  } catch {
    readable = false; // not JSON: an error page from something in between
  }
  if (res.ok) {
    if (!readable) throw new ApiError(res.status, "bad_answer", "The server's answer could not be read.");
    return parsed as T;
  }
  const err = (parsed as { error?: Record<string, unknown> } | null)?.error;
  throw new ApiError(
    res.status,
    typeof err?.code === "string" ? err.code : `http:${res.status}`,
    typeof err?.message === "string" && err.message ? err.message : `The server answered ${res.status}.`,
    strings(err?.details),
    fieldsOf(err?.fields),
  );
}

/** GET a JSON body; a failed answer throws `ApiError` with the server's message. */
export function getJson<T>(url: string): Promise<T> {
  return api<T>(url);
}

/**
 * The body at `url`, loaded on mount and again whenever `url` changes (no request for null). While
 * a new URL loads, the previous body stays on screen (a table does not blink while a filter
 * changes). A failed load leaves `data` as it was and sets `error`.
 */
export function useJson<T>(url: string | null): {
  data: T | null;
  error: ApiError | null;
  loading: boolean;
  reload: () => Promise<void>;
} {
  const [data, setData] = useState<T | null>(null);
  const [error, setError] = useState<ApiError | null>(null);
  const [loading, setLoading] = useState(url !== null);
  const latest = useRef(0);
  const reload = useCallback(async () => {
    if (url === null) return;
    const n = ++latest.current; // an answer to an older URL that arrives late is dropped
    setLoading(true);
    setError(null);
    try {
      const body = await api<T>(url);
      if (n === latest.current) setData(body);
    } catch (e) {
      if (n === latest.current) setError(e instanceof ApiError ? e : new ApiError(0, "offline", problemText(e)));
    } finally {
      if (n === latest.current) setLoading(false);
    }
  }, [url]);
  useEffect(() => {
    void reload();
  }, [reload]);
  return { data, error, loading, reload };
}
