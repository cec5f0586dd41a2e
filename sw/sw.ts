/// <reference lib="webworker" />
// The service worker (Serwist): precaches the app shell, pages, fonts and icons so the tablet
// opens with no network; API responses are never cached (data lives in the tablet store).
import type { PrecacheEntry, SerwistGlobalConfig } from "serwist";
import { CacheFirst, NetworkFirst, Serwist } from "serwist";

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
// Not the worker's business: a download or a photo from /api/ (a navigation, an image) is never
// matched by the routes below, so it is neither answered nor cached here.
const notApi = (url: URL) => !url.pathname.startsWith("/api/");

const serwist: Serwist = new Serwist({
  precacheEntries: self.__SW_MANIFEST,
  precacheOptions: { ignoreURLParametersMatching: [/.*/] },
  skipWaiting: false,
  clientsClaim: true,
  navigationPreload: false,
  // No route for /api/: the worker never answers (nor caches) an API request; see the install
  // listener below, which keeps those requests from reaching the worker at all.
  runtimeCaching: [
    {
      matcher: ({ request, url, sameOrigin }) =>
        sameOrigin && request.mode === "navigate" && CRYOSTAT_PAGE.test(url.pathname),
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
    {
      matcher: ({ request, url, sameOrigin }) => sameOrigin && notApi(url) && request.mode === "navigate",
      handler: pages,
    },
    {
      matcher: ({ request, url, sameOrigin }) =>
        sameOrigin && notApi(url) && ["style", "script", "font", "image", "worker"].includes(request.destination),
      handler: new CacheFirst({ cacheName: "assets" }),
    },
  ],
  fallbacks: { entries: [{ url: "/offline", matcher: ({ request }) => request.destination === "document" }] },
});

// API requests go straight to the network without waking the worker (the Service Worker Static
// Routing API; browsers without it dispatch them to the worker, which leaves them unanswered, so
// they go to the network all the same). A push body of ~1 MB then no longer travels page →
// worker → network and its answer back the same way: that copy cost as much as the server's apply.
type StaticRoute = { condition: { urlPattern: string }; source: "network" };
self.addEventListener("install", (event) => {
  const routes = event as ExtendableEvent & { addRoutes?: (r: StaticRoute[]) => Promise<void> };
  if (routes.addRoutes)
    event.waitUntil(
      routes.addRoutes([{ condition: { urlPattern: "/api/*" }, source: "network" }]).catch(() => undefined),
    );
});

self.addEventListener("message", (event) => {
  if ((event.data as { type?: string } | undefined)?.type === "SKIP_WAITING") void self.skipWaiting();
});

serwist.addEventListeners();
