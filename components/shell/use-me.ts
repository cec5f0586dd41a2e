"use client";
// The signed-in user for the client. The page HTML is the same for everyone (so the service
// worker can cache it); who is signed in comes from /api/me when online, else from the tablet
// store's session (the one every sync's pull renews), so the header and the forms know the user
// offline.
import { useEffect, useState } from "react";
import { ApiError, api } from "@/components/ui/use-json";
import { localDb } from "@/lib/local/db";
import { useSessionUser } from "@/lib/local/hooks";
import type { SessionUser } from "@/lib/schemas/user";
import { forgetPin } from "@/lib/signing/tablet";

/** Forget the cached signing PINs of these users (sign-out clears the tablet). */
export function forgetMe(userIds: readonly (string | null | undefined)[]): void {
  for (const id of new Set(userIds)) {
    if (!id) continue;
    try {
      forgetPin(id);
    } catch {
      /* storage unavailable: nothing cached */
    }
  }
}

export function useMe(): { me: SessionUser | null; loading: boolean } {
  const stored = useSessionUser();
  const [fetched, setFetched] = useState<SessionUser | null>(null);
  const [asked, setAsked] = useState(false);
  useEffect(() => {
    let cancelled = false;
    api<{ user: SessionUser }>("/api/me")
      .then(
        ({ user }) => !cancelled && setFetched(user),
        async (e: unknown) => {
          if (cancelled || !(e instanceof ApiError) || e.status !== 401) return; // offline: the store's user
          forgetMe([(await localDb().getMeta("session"))?.user.id]);
          window.location.assign(`/signin?next=${encodeURIComponent(location.pathname)}`);
        },
      )
      .finally(() => !cancelled && setAsked(true));
    return () => {
      cancelled = true;
    };
  }, []);
  return { me: fetched ?? stored ?? null, loading: !asked };
}
