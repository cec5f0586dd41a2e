// Where the browser for e2e tests lives, and the one message a developer sees when it is missing.
// playwright-core cannot download browsers on this network, so the tests drive Debian's Chromium.
import { accessSync, constants } from "node:fs";

export const DEFAULT_CHROMIUM_PATH = "/usr/bin/chromium";

export function chromiumPath(): string {
  return process.env.CHROMIUM_PATH || DEFAULT_CHROMIUM_PATH;
}

export function chromiumMissingMessage(path: string): string {
  return (
    `Chromium not found at ${path} — install it with: apt-get update && apt-get install -y chromium` +
    (process.env.CHROMIUM_PATH ? " (or unset CHROMIUM_PATH)" : "")
  );
}

/** Throws (never skips) when the browser is not there: a missing browser is a broken setup. */
export function assertChromiumInstalled(): string {
  const path = chromiumPath();
  try {
    accessSync(path, constants.X_OK);
  } catch {
    throw new Error(chromiumMissingMessage(path));
  }
  return path;
}

/**
 * Flags known to work with Debian's Chromium in a container (DEVELOPERS.md, Tests): no sandbox as
 * root, no GPU, and no background networking, which on a closed network would only produce refused
 * connections.
 */
export const CHROMIUM_ARGS = [
  "--headless",
  "--no-sandbox",
  "--disable-gpu",
  "--disable-quic",
  "--no-first-run",
  "--disable-background-networking",
  "--disable-component-update",
  "--disable-sync",
];
