// Mapping typed results and AppErrors to HTTP responses (Web Response, no framework import),
// and the checks every state-changing route handler makes on its request.
import "server-only";
import { z } from "zod";
import { AppError, detailLines, fieldErrors } from "@/lib/errors";

const NO_STORE = { "Cache-Control": "no-store" };

export function json(body: unknown, status = 200): Response {
  return Response.json(body, { status, headers: NO_STORE });
}

/**
 * The one mapping of a thrown error to a response: an AppError answers its status with its code,
 * message, details and field problems; a zod failure answers 400 with its field problems; anything
 * else is logged and answers 500 without internals.
 */
export function errorResponse(e: unknown): Response {
  if (e instanceof AppError) {
    const fields = e.fields ?? [];
    return json({ error: { code: e.code, message: e.message, details: e.details ?? [], fields } }, e.status);
  }
  if (e instanceof z.ZodError) {
    const fields = fieldErrors(e);
    const error = {
      code: "bad_request:request",
      message: "Check the highlighted fields.",
      details: detailLines(fields),
    };
    return json({ error: { ...error, fields } }, 400);
  }
  console.error("[rimelog] unexpected error", e);
  return json(
    { error: { code: "internal", message: "Something went wrong on the server. Nothing was changed; try again." } },
    500,
  );
}

/** Run a handler body and turn any thrown AppError into its response. */
export async function handle(fn: () => Promise<Response>): Promise<Response> {
  try {
    return await fn();
  } catch (e) {
    return errorResponse(e);
  }
}

/** True when the request's Origin header names this server's own host (false when absent or malformed). */
export function isSameOrigin(req: Request): boolean {
  const origin = req.headers.get("origin");
  const host = req.headers.get("x-forwarded-host") ?? req.headers.get("host");
  if (!origin || !host) return false;
  try {
    return new URL(origin).host === host;
  } catch {
    return false;
  }
}

/**
 * CSRF defence for state changes: a JSON content type and, when the browser sends one, an
 * Origin equal to the server's own. Returns the parsed body, bounded in bytes.
 */
export async function readJson(req: Request, maxBytes = 1_000_000): Promise<unknown> {
  const type = req.headers.get("content-type") ?? "";
  if (!type.toLowerCase().startsWith("application/json")) {
    throw new AppError("unsupported", "request", "Send the request as application/json.");
  }
  if (req.headers.get("origin") && !isSameOrigin(req)) {
    throw new AppError("forbidden", "origin", "Cross-origin requests may not change data.");
  }
  const declared = Number(req.headers.get("content-length") ?? "0");
  if (declared > maxBytes)
    throw new AppError(
      "too_large",
      "request",
      `The request is ${declared} bytes; the limit is ${maxBytes} bytes. Send fewer entries at a time.`,
    );
  const text = await req.text();
  if (text.length > maxBytes)
    throw new AppError("too_large", "request", `The request is over ${maxBytes} bytes. Send fewer entries at a time.`);
  try {
    return JSON.parse(text);
  } catch {
    throw new AppError("bad_request", "request", "The request body is not valid JSON.");
  }
}
