/// <reference lib="webworker" />
// The service worker (Serwist): precaches the app shell, pages, fonts and icons so the tablet
// opens with no network; API responses are never cached (data lives in the tablet store).
import type { PrecacheEntry, SerwistGlobalConfig } from "serwist";
import { CacheFirst, NetworkFirst, NetworkOnly, Serwist } from "serwist";

declare global {
  interface WorkerGlobalScope extends SerwistGlobalConfig {
    __SW_MANIFEST: (PrecacheEntry | string)[] | undefined;
  }
}
declare const self: ServiceWorkerGlobalScope;

const pages = new NetworkFirst({ cacheName: "pages", networkTimeoutSeconds: 4 });
// A strategy of its own: Serwist adds the /offline fallback plugin to the strategies it is given
// in runtimeCaching, and that would answer before the cryostat template below could.
const cryostatPages = new NetworkFirst({ cacheName: "pages", networkTimeoutSeconds: 4 });
// Every cryostat page has the same HTML (the id is read from the address on the tablet), so a
// cryostat never opened online is still served offline from the precached template.
const CRYOSTAT_PAGE = /^\/cryostats\/[^/]+\/?$/;
const CRYOSTAT_TEMPLATE = "/cryostats/_";

const serwist: Serwist = new Serwist({
  precacheEntries: self.__SW_MANIFEST,
  precacheOptions: { ignoreURLParametersMatching: [/.*/] },
  skipWaiting: false,
  clientsClaim: true,
  navigationPreload: false,
  runtimeCaching: [
    { matcher: ({ url, sameOrigin }) => sameOrigin && url.pathname.startsWith("/api/"), handler: new NetworkOnly() },
    {
      matcher: ({ request, url, sameOrigin }) => sameOrigin && request.mode === "navigate" && CRYOSTAT_PAGE.test(url.pathname),
      handler: async (options) => {
        try {
          return await cryostatPages.handle(options);
        } catch (e) {
          const template = await serwist.matchPrecache(CRYOSTAT_TEMPLATE);
          if (template) return template;
          throw e;
        }
      },
    },
    { matcher: ({ request, sameOrigin }) => sameOrigin && request.mode === "navigate", handler: pages },
    {
      matcher: ({ request, sameOrigin }) => sameOrigin && ["style", "script", "font", "image", "worker"].includes(request.destination),
      handler: new CacheFirst({ cacheName: "assets" }),
    },
  ],
  fallbacks: { entries: [{ url: "/offline", matcher: ({ request }) => request.destination === "document" }] },
});

self.addEventListener("message", (event) => {
  if ((event.data as { type?: string } | undefined)?.type === "SKIP_WAITING") void self.skipWaiting();
});

serwist.addEventListeners();
