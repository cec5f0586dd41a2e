"use client";
// Sign-out that seals the tablet: it first tries to send what is waiting, refuses (with the
// reason) while this user's entries or photos are unsent, asks before leaving refused entries
// behind, then clears this user's data from the tablet and ends the session.
import { signOut } from "next-auth/react";
import { useState } from "react";
import { forgetMe } from "@/components/shell/use-me";
import { Button } from "@/components/ui/button";
import { localDb } from "@/lib/local/db";
import { checkSignOut, clearLocalData } from "@/lib/local/session";
import { syncLoop } from "./runtime";

/** `userId`: who the page knows as signed in (their cached signing PIN is forgotten too). */
export function SignOutButton({ userId }: { userId?: string | undefined }) {
  const [busy, setBusy] = useState(false);
  const [message, setMessage] = useState<string | null>(null);
  const [confirmRejected, setConfirmRejected] = useState<number | null>(null);

  const finish = async () => {
    const stored = (await localDb().getMeta("session"))?.user;
    await clearLocalData(localDb());
    forgetMe([userId, stored?.id]);
    await signOut({ callbackUrl: "/signin" });
  };

  const start = async () => {
    setBusy(true);
    setMessage(null);
    try {
      if (navigator.onLine) await syncLoop().run();
      const check = await checkSignOut(localDb());
      if (!check.ok) {
        setMessage(check.message);
        return;
      }
      if (check.rejected > 0) {
        setConfirmRejected(check.rejected);
        return;
      }
      await finish();
    } catch (e) {
      setMessage(`Not signed out: ${(e as Error).message}`);
    } finally {
      setBusy(false);
    }
  };

  return (
    <div className="relative">
      <Button onClick={() => void start()} disabled={busy}>
        {busy ? "Signing out…" : "Sign out"}
      </Button>
      {(message || confirmRejected !== null) && (
        <div
          role="alert"
          className="absolute right-0 top-full z-30 mt-2 w-[min(24rem,90vw)] rounded-2xl border-2 border-danger bg-panel p-4 text-ink shadow-lg"
        >
          {message && <p>{message}</p>}
          {confirmRejected !== null && (
            <>
              <p className="mb-2">
                {confirmRejected} {confirmRejected === 1 ? "entry was" : "entries were"} refused by the server and will
                be removed from this tablet when you sign out. Open the sync status to read them first.
              </p>
              <Button variant="danger" className="w-full" onClick={() => void finish()}>
                Sign out and remove them
              </Button>
            </>
          )}
          <Button
            variant="ghost"
            className="mt-2 w-full"
            onClick={() => {
              setMessage(null);
              setConfirmRejected(null);
            }}
          >
            Close
          </Button>
        </div>
      )}
    </div>
  );
}
