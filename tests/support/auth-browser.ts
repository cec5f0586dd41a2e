// A browser's side of next-auth, in process: a cookie jar that signs in through the real
// next-auth route (CSRF token, credentials callback, session refresh, sign-out) and calls route
// handlers with its cookies. next-auth's route handler and getServerSession read the request's
// cookies and headers with a CommonJS `require("next/headers")` (outside vitest's module mocks),
// so `installHeaderJar()` points that module's `cookies()` and `headers()` at a jar that each call
// fills. Set NEXTAUTH_URL and AUTH_SECRET before server code is imported.
import { createRequire } from "node:module";
import { NextRequest } from "next/server";

export type HeaderJar = { cookies: Map<string, string>; headers: Record<string, string> };

/** Make `next/headers` (as next-auth requires it) read from a jar; answers the jar. */
export function installHeaderJar(): HeaderJar {
  const jar: HeaderJar = { cookies: new Map(), headers: {} };
  const mod = createRequire(import.meta.url)("next/headers") as Record<string, unknown>;
  mod.headers = async () => new Headers(jar.headers);
  mod.cookies = async () => ({
    getAll: () => [...jar.cookies].map(([name, value]) => ({ name, value })),
    get: (name: string) => (jar.cookies.has(name) ? { name, value: jar.cookies.get(name) } : undefined),
  });
  return jar;
}

type Handler = (req: NextRequest, ctx: { params: Promise<unknown> }) => Promise<Response>;
type AuthRoute = { GET: Handler; POST: Handler };

export const ORIGIN = "http://localhost:3000";
export const SESSION_COOKIE = "next-auth.session-token";

export class AuthBrowser {
  readonly cookies = new Map<string, string>();

  constructor(
    private readonly jar: HeaderJar,
    private readonly auth: AuthRoute,
    /** The address it connects from (X-Forwarded-For, as Next sets it from the socket). */
    readonly address = "203.0.113.7",
  ) {}

  /** A second browser holding a copy of this one's cookies (a copied session cookie). */
  copy(address = this.address): AuthBrowser {
    const other = new AuthBrowser(this.jar, this.auth, address);
    for (const [k, v] of this.cookies) other.cookies.set(k, v);
    return other;
  }

  private headers(extra: Record<string, string> = {}): Record<string, string> {
    const cookie = [...this.cookies].map(([k, v]) => `${k}=${v}`).join("; ");
    return { host: "localhost:3000", "x-forwarded-for": this.address, ...(cookie ? { cookie } : {}), ...extra };
  }

  /** Point next/headers at this browser, for the call that follows. */
  private enter(extra: Record<string, string> = {}): Record<string, string> {
    const h = this.headers(extra);
    this.jar.cookies = new Map(this.cookies);
    this.jar.headers = h;
    return h;
  }

  private keep(res: Response): Response {
    for (const line of res.headers.getSetCookie()) {
      const [pair, ...attrs] = line.split(";");
      const eq = pair!.indexOf("=");
      const name = pair!.slice(0, eq).trim();
      const value = decodeURIComponent(pair!.slice(eq + 1).trim());
      const gone = attrs.some((a) => /^\s*max-age=0\s*$/i.test(a) || /^\s*expires=Thu, 01 Jan 1970/i.test(a));
      if (gone || value === "") this.cookies.delete(name);
      else this.cookies.set(name, value);
    }
    return res;
  }

  /** Call next-auth's route: `segments` as in /api/auth/<segments>. */
  async authRoute(method: "GET" | "POST", segments: string[], form?: Record<string, string>): Promise<Response> {
    const extra: Record<string, string> = form ? { "content-type": "application/x-www-form-urlencoded" } : {};
    const headers = this.enter(extra);
    const req = new NextRequest(`${ORIGIN}/api/auth/${segments.join("/")}`, {
      method,
      headers,
      ...(form ? { body: new URLSearchParams(form).toString() } : {}),
    });
    const handler = method === "GET" ? this.auth.GET : this.auth.POST;
    return this.keep(await handler(req, { params: Promise.resolve({ nextauth: segments }) }));
  }

  async csrf(): Promise<string> {
    const res = await this.authRoute("GET", ["csrf"]);
    return ((await res.json()) as { csrfToken: string }).csrfToken;
  }

  /** What next-auth's client `signIn("credentials", { redirect: false })` posts. */
  async signIn(email: string, password: string, csrfToken?: string): Promise<Response> {
    const token = csrfToken ?? (await this.csrf());
    return this.authRoute("POST", ["callback", "credentials"], {
      email,
      password,
      csrfToken: token,
      callbackUrl: `${ORIGIN}/`,
      json: "true",
    });
  }

  /** `GET /api/auth/session`: the client's session refresh (next-auth writes a new token). */
  async session(): Promise<Record<string, unknown>> {
    return (await (await this.authRoute("GET", ["session"])).json()) as Record<string, unknown>;
  }

  async signOut(): Promise<Response> {
    const csrfToken = await this.csrf();
    return this.authRoute("POST", ["signout"], { csrfToken, callbackUrl: `${ORIGIN}/signin`, json: "true" });
  }

  /** Call a route handler made with route() as this browser (same origin). */
  async call(
    handler: (req: Request, ctx?: unknown) => Promise<Response>,
    path: string,
    init: { method?: string; body?: unknown; params?: Record<string, string> } = {},
  ): Promise<Response> {
    const extra: Record<string, string> = { origin: ORIGIN };
    if (init.body !== undefined) extra["content-type"] = "application/json";
    const headers = this.enter(extra);
    const req = new NextRequest(`${ORIGIN}${path}`, {
      method: init.method ?? (init.body === undefined ? "GET" : "POST"),
      headers,
      ...(init.body === undefined ? {} : { body: JSON.stringify(init.body) }),
    });
    return this.keep(await handler(req, { params: Promise.resolve(init.params ?? {}) }));
  }

  get sessionToken(): string | undefined {
    return this.cookies.get(SESSION_COOKIE);
  }
}
