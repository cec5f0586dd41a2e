"use client";
// The page's query, read only after hydration. Pages like /runs?id=… and /handover?cryostat=…
// are one page for every query: the service worker serves the copy it cached for any query when
// offline, and the server renders each request with its own query. So the first render (on the
// server, and on the client while hydrating) must not depend on the query, or the cached HTML and
// the client's first render would differ (a hydration error): it renders the loading state.
import { useSearchParams } from "next/navigation";
import { useEffect, useState } from "react";

/** The query parameters once the page has hydrated; null before. */
export function useQueryParams(): URLSearchParams | null {
  const params = useSearchParams();
  const [hydrated, setHydrated] = useState(false);
  useEffect(() => setHydrated(true), []);
  return hydrated ? params : null;
}
