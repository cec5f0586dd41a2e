// Errors as codes: `type:surface`, mapped to an HTTP status in one place. Database details are
// logged, never returned to the client.
export type ErrorType =
  | "bad_request"
  | "unauthorized"
  | "forbidden"
  | "not_found"
  | "conflict"
  | "too_large"
  | "rate_limited"
  | "unsupported"
  | "unavailable";

const STATUS: Record<ErrorType, number> = {
  bad_request: 400,
  unauthorized: 401,
  forbidden: 403,
  not_found: 404,
  conflict: 409,
  too_large: 413,
  unsupported: 415,
  rate_limited: 429,
  unavailable: 503,
};

export class AppError extends Error {
  constructor(
    public readonly type: ErrorType,
    public readonly surface: string,
    message: string,
    public readonly details?: string[],
  ) {
    super(message);
  }
  get code(): string {
    return `${this.type}:${this.surface}`;
  }
  get status(): number {
    return STATUS[this.type];
  }
}

export function statusOf(type: ErrorType): number {
  return STATUS[type];
}
