// Next.js configuration: PGlite stays a server external (its wasm is traced at run time),
// Serwist compiles sw/sw.ts into public/sw.js, and security headers are set for every route (the
// Content-Security-Policy and HSTS are set per request by proxy.ts: pages get a script nonce, and
// a route that sets its own CSP, such as a download, keeps it).
import { randomUUID } from "node:crypto";
import withSerwistInit from "@serwist/next";

// Pages a technician needs with no network; they are precached with the build's revision.
const revision = process.env.RIMELOG_BUILD_ID ?? randomUUID();
const offlinePages = [
  "/",
  "/signin",
  "/offline",
  "/cryostats/_",
  "/calc",
  "/manifest.webmanifest",
  "/procedures",
  "/runs",
  "/handover",
  "/transfers/new",
  "/quench/new",
];

const withSerwist = withSerwistInit({
  swSrc: "sw/sw.ts",
  swDest: "public/sw.js",
  register: false,
  disable: process.env.NODE_ENV === "development",
  // Serwist reloads every page on the `online` event by default: that would wipe what a
  // technician is typing when the Wi-Fi comes back. The sync loop handles reconnects instead.
  reloadOnOnline: false,
  additionalPrecacheEntries: offlinePages.map((url) => ({ url, revision })),
});

/** @type {import('next').NextConfig} */
const nextConfig = {
  distDir: process.env.NEXT_DIST_DIR || ".next",
  serverExternalPackages: ["@electric-sql/pglite"],
  outputFileTracingIncludes: { "/**": ["./db/migrations/**/*"] },
  poweredByHeader: false,
  async headers() {
    return [
      {
        source: "/:path*",
        headers: [
          { key: "X-Content-Type-Options", value: "nosniff" },
          { key: "Referrer-Policy", value: "same-origin" },
          { key: "Permissions-Policy", value: "camera=(self), microphone=(), geolocation=()" },
        ],
      },
      {
        source: "/api/:path*",
        headers: [{ key: "Cache-Control", value: "no-store" }],
      },
    ];
  },
};

export default withSerwist(nextConfig);
