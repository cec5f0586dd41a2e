"use client";
// The signed-in user for the client. The page HTML is the same for everyone (so the service
// worker can cache it); who is signed in comes from /api/me, remembered for offline use.
import { useEffect, useState } from "react";
import { forget, recall } from "@/components/ui/remembered";
import type { SessionUser } from "@/lib/schemas/user";
import { forgetPin } from "@/lib/signing/tablet";

const KEY = "rimelog-me";

const remembered = () => recall<SessionUser>(KEY);

/** Forget the remembered user and that user's cached signing PIN (sign-out clears the tablet). */
export function forgetMe(): void {
  const me = remembered();
  if (me) forgetPin(me.id);
  forget(KEY);
}

export function useMe(): { me: SessionUser | null; loading: boolean } {
  const [me, setMe] = useState<SessionUser | null>(null);
  const [loading, setLoading] = useState(true);
  useEffect(() => {
    setMe(remembered());
    let cancelled = false;
    fetch("/api/me", { cache: "no-store" })
      .then(async (r) => {
        if (cancelled) return;
        if (r.ok) {
          const { user } = (await r.json()) as { user: SessionUser };
          setMe(user);
          localStorage.setItem(KEY, JSON.stringify(user));
        } else if (r.status === 401) {
          forgetMe();
          setMe(null);
          window.location.assign(`/signin?next=${encodeURIComponent(location.pathname)}`);
        }
      })
      .catch(() => {
        /* offline: keep the remembered user */
      })
      .finally(() => !cancelled && setLoading(false));
    return () => {
      cancelled = true;
    };
  }, []);
  return { me, loading };
}
