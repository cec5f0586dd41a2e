// The one wrapper every route handler under app/api is made with. A route declares who may call it
// (roles as data), the zod schemas of its route params, query string and JSON body, and the body's
// byte bound; the wrapper checks the session, parses the input (state changes: JSON content type,
// same origin, bounded; raw-bytes uploads: same origin, application/octet-stream), hands the
// handler { req, user, db, params, query, body } and turns every thrown error into its response
// in one place (respond.ts `errorResponse`). The handler it returns carries its access as data
// (`handler.access`), so a test can walk every route, method and role.
import "server-only";
import type { z } from "zod";
import { type Db, getDb } from "@/db";
import { AppError, detailLines, type ErrorType, fieldErrors, plainWords } from "@/lib/errors";
import type { Role, SessionUser } from "@/lib/schemas/user";
import { requireSession } from "@/server/auth/require";
import type { LiveSession } from "@/server/auth/sessions";
import { errorResponse, readJson } from "./respond";
import { requireByteUpload } from "./upload";

/** Who may call: anyone (signed out too), any signed-in user, or one of the listed roles. */
export type Access = "public" | "signed-in" | readonly [Role, ...Role[]];

/** What a refused input answers: a message (400 with this route's surface), or a type, surface and message. */
export type Invalid = string | { type?: ErrorType; surface?: string; message: string };

type Schema = z.ZodType;
/** A zod schema for a JSON body; "json" for JSON the handler checks itself; "bytes" for a raw upload. */
type BodySpec = Schema | "json" | "bytes";

export interface RouteSpec<A extends Access, P, Q, B> {
  access: A;
  /** The surface of this route's error codes (`bad_request:<surface>`). */
  surface: string;
  params?: P;
  query?: Q;
  body?: B;
  /** Largest JSON body accepted, in bytes (default 1 MB, as `readJson`). */
  maxBytes?: number;
  /** What to answer when a schema refuses the input (default "Check the highlighted fields."). */
  invalid?: Invalid;
  /** Callable while the person must still change their password (the change itself, /api/me). */
  duringPasswordChange?: boolean;
}

type Parsed<S> = S extends Schema ? z.output<S> : undefined;

export interface RouteInput<A extends Access, P, Q, B> {
  req: Request;
  /** The signed-in user (null on a public route, which never looks at the session). */
  user: A extends "public" ? null : SessionUser;
  /** The server-side session's id (null on a public route). */
  sessionId: A extends "public" ? null : string;
  db: Db;
  params: Parsed<P>;
  query: Parsed<Q>;
  body: B extends Schema ? z.output<B> : B extends "json" ? unknown : undefined;
  /** Milliseconds spent on the session check and on reading the body (for a Server-Timing header). */
  timings: { auth: number; read: number };
}

/** Next 16 hands dynamic segments as a Promise; static routes get one of {} (tests may pass none). */
// biome-ignore lint/suspicious/noExplicitAny: Next checks each route's own params type against this one; the wrapper parses them with the route's zod schema.
export type RouteContext = { params: Promise<any> };

/** Next passes the context to every handler; tests may call one without it. */
export type RouteHandler = {
  (req: Request): Promise<Response>;
  // Last, so that Next's generated route types read this signature.
  (req: Request, ctx: RouteContext): Promise<Response>;
  readonly access: Access;
};

const DEFAULT_INVALID = "Check the highlighted fields.";

/**
 * Parse `value` with `schema` (problems in plain words), or throw the route's 400 with the field
 * problems (`prefix` puts their paths under a field of a larger body).
 */
export function parseInput<S extends Schema>(
  schema: S,
  value: unknown,
  how: { surface: string; invalid?: Invalid; prefix?: string },
): z.output<S> {
  const r = schema.safeParse(value, { error: plainWords });
  if (r.success) return r.data;
  const invalid: Exclude<Invalid, string> =
    typeof how.invalid === "string" ? { message: how.invalid } : (how.invalid ?? { message: DEFAULT_INVALID });
  const fields = fieldErrors(r.error, how.prefix);
  throw new AppError(
    invalid.type ?? "bad_request",
    invalid.surface ?? how.surface,
    invalid.message,
    detailLines(fields),
    fields,
  );
}

async function signedIn(access: Access, duringPasswordChange: boolean): Promise<LiveSession | null> {
  if (access === "public") return null;
  return requireSession({ roles: access === "signed-in" ? [] : access, duringPasswordChange });
}

/**
 * Route params and query values are short text: a NUL or another control character is refused
 * here, for every route, before a schema or the database sees it (PostgreSQL refuses NUL in text).
 */
/**
 * PostgreSQL's data exceptions for a value it cannot read (SQLSTATE class 22: invalid text for a
 * type, a date out of range, a bad character, a number out of range). A schema should have refused
 * such a value first; this holds for every route where one did not, answering 400, not 500.
 */
const MALFORMED_SQLSTATES = new Set(["22P02", "22007", "22008", "22021", "22P05", "22003"]);
function isMalformedValue(e: unknown): boolean {
  for (let x: unknown = e, depth = 0; x && typeof x === "object" && depth < 4; depth++) {
    const code = (x as { code?: unknown }).code;
    if (typeof code === "string" && MALFORMED_SQLSTATES.has(code)) return true;
    x = (x as { cause?: unknown }).cause;
  }
  return false;
}

function hasControlCharacter(text: string): boolean {
  for (let i = 0; i < text.length; i++) {
    const c = text.charCodeAt(i);
    if (c < 0x20 || c === 0x7f) return true;
  }
  return false;
}

function refuseControlCharacters(values: Record<string, unknown>, surface: string, where: string): void {
  const bad = Object.entries(values).filter(([, v]) =>
    (Array.isArray(v) ? v : [v]).some((x) => typeof x === "string" && hasControlCharacter(x)),
  );
  if (!bad.length) return;
  const fields = bad.map(([path]) => ({ path, message: "Remove the control characters." }));
  throw new AppError("bad_request", surface, `Check the ${where}.`, detailLines(fields), fields);
}

async function readBody(req: Request, spec: RouteSpec<Access, unknown, unknown, unknown>): Promise<unknown> {
  const body = spec.body as BodySpec | undefined;
  if (body === undefined) return undefined;
  if (body === "bytes") {
    requireByteUpload(req, spec.surface);
    return undefined;
  }
  const raw = await readJson(req, spec.maxBytes);
  return body === "json" ? raw : parseInput(body, raw, spec);
}

export function route<
  A extends Access,
  P extends Schema | undefined = undefined,
  Q extends Schema | undefined = undefined,
  B extends BodySpec | undefined = undefined,
>(spec: RouteSpec<A, P, Q, B>, handler: (input: RouteInput<A, P, Q, B>) => Promise<Response>): RouteHandler {
  const access = Object.freeze(typeof spec.access === "string" ? spec.access : [...spec.access]) as Access;
  const generic = spec as RouteSpec<Access, unknown, unknown, unknown>;
  const run = async (req: Request, ctx?: RouteContext): Promise<Response> => {
    try {
      const t0 = performance.now();
      const live = await signedIn(access, spec.duringPasswordChange ?? false);
      const t1 = performance.now();
      const rawParams = ((await ctx?.params) ?? {}) as Record<string, unknown>;
      const search = Object.fromEntries(new URL(req.url).searchParams);
      refuseControlCharacters(rawParams, spec.surface, "address");
      refuseControlCharacters(search, spec.surface, "query");
      const params = spec.params ? parseInput(spec.params, rawParams, spec) : undefined;
      const query = spec.query ? parseInput(spec.query, search, spec) : undefined;
      const body = await readBody(req, generic);
      const timings = { auth: t1 - t0, read: performance.now() - t1 };
      const user = live?.user ?? null;
      const sessionId = live?.sessionId ?? null;
      const input = { req, user, sessionId, db: await getDb(), params, query, body, timings };
      return await handler(input as RouteInput<A, P, Q, B>);
    } catch (e) {
      if (isMalformedValue(e)) {
        return errorResponse(
          new AppError("bad_request", spec.surface, "Check the address and query: a value is malformed."),
        );
      }
      return errorResponse(e);
    }
  };
  return Object.assign(run, { access });
}
