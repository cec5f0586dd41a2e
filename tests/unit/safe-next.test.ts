// The sign-in page's `next` redirect stays on the site: path only, resolved as a browser would
// (WHATWG URL Standard: tabs and newlines removed, "\" read as "/" in http(s) URLs).
import { describe, expect, it } from "vitest";
import { safeNextPath } from "@/lib/safe-next";

/** What `?next=<raw>` gives the page: URLSearchParams decodes the percent escapes. */
const fromQuery = (raw: string) => new URLSearchParams(`next=${raw}`).get("next");

describe("safeNextPath", () => {
  it("keeps a path on the site, with its query", () => {
    expect(safeNextPath("/cryostats/heron")).toBe("/cryostats/heron");
    expect(safeNextPath("/audit?from=2026-11-01&flag=late")).toBe("/audit?from=2026-11-01&flag=late");
    expect(safeNextPath(fromQuery("%2Fruns%3Fid%3D1"))).toBe("/runs?id=1");
  });

  it("the three strings from the issue stay on the origin", () => {
    for (const raw of ["/%5Cexample.org/", "/%09/example.org/", "//example.org"]) {
      const next = safeNextPath(fromQuery(raw));
      expect(next.startsWith("/")).toBe(true);
      expect(next.startsWith("//")).toBe(false);
      // Resolved against the site the way window.location.assign would: same origin.
      expect(new URL(next, "https://rimelog.example").origin).toBe("https://rimelog.example");
    }
  });

  it("refuses other hosts, schemes and tricks", () => {
    for (const next of [
      "https://example.org/",
      "javascript:alert(1)",
      "/\\\\example.org",
      "/\n/example.org",
      "/.//example.org",
      "\\/example.org",
      "",
      null,
      undefined,
      "cryostats",
    ]) {
      expect(`${JSON.stringify(next)} → ${safeNextPath(next)}`).toBe(`${JSON.stringify(next)} → /`);
    }
  });
});
