"use client";
// The signing PIN on this tablet: set it (online, with the password), and refresh the cached
// verifier's lifetime whenever the tablet is online and signed in.
import { useEffect, useState } from "react";
import { Button } from "@/components/ui/button";
import { Notice, Panel } from "@/components/ui/panel";
import { api, problemText } from "@/components/ui/use-json";
import { formatDate } from "@/lib/format";
import type { SessionUser } from "@/lib/schemas/user";
import { pinProblem } from "@/lib/signing/pin-rules";
import { type CachedPin, cachedPin, storePin } from "@/lib/signing/tablet";

type Verifier = { saltB64: string; iterations: number; verifier: string; expiresAt: string };

export function PinPanel({ me }: { me: SessionUser }) {
  const [pin, setPinState] = useState<CachedPin | null>(null);
  const [open, setOpen] = useState(false);
  const [password, setPassword] = useState("");
  const [next, setNext] = useState("");
  const [again, setAgain] = useState("");
  const [msg, setMsg] = useState<{ tone: "ok" | "danger"; text: string } | null>(null);
  const [busy, setBusy] = useState(false);

  useEffect(() => {
    setPinState(cachedPin(me.id));
    if (!navigator.onLine) return;
    api<{ pin: Verifier | null }>("/api/pin").then(
      ({ pin: v }) => {
        if (v) {
          storePin({ userId: me.id, ...v });
          setPinState(cachedPin(me.id));
        }
      },
      () => undefined, // the cached verifier stays as it is
    );
  }, [me.id]);

  async function save() {
    setMsg(null);
    const problem = pinProblem(next);
    if (problem) return setMsg({ tone: "danger", text: problem });
    if (next !== again) return setMsg({ tone: "danger", text: "The two PINs differ." });
    setBusy(true);
    try {
      const body = await api<{ pin?: Verifier }>("/api/pin", { json: { password, pin: next } });
      if (!body.pin) throw new Error("The server's answer carried no PIN verifier; the PIN was not set.");
      storePin({ userId: me.id, ...body.pin });
      setPinState(cachedPin(me.id));
      setOpen(false);
      setPassword("");
      setNext("");
      setAgain("");
      setMsg({ tone: "ok", text: "Signing PIN set on this tablet." });
    } catch (e) {
      setMsg({
        tone: "danger",
        text: problemText(e, "No connection: a PIN can only be set online."),
      });
    } finally {
      setBusy(false);
    }
  }

  const input = "num w-full rounded-xl border-2 border-line bg-bg px-4 py-2 text-xl";
  return (
    <Panel aria-labelledby="pin-title" className="no-print">
      <div className="flex flex-wrap items-center justify-between gap-2">
        <div>
          <h2 id="pin-title" className="text-xl font-bold">
            Signing PIN
          </h2>
          <p className="text-muted" data-pin-status>
            {pin
              ? `Set on this tablet, usable offline until ${formatDate(pin.expiresAt)}.`
              : "Not set on this tablet: signing offline needs it."}
          </p>
        </div>
        <Button onClick={() => setOpen((o) => !o)}>{pin ? "Change PIN" : "Set PIN"}</Button>
      </div>
      {open && (
        <div className="mt-3 grid gap-3 sm:grid-cols-3">
          <label className="flex flex-col gap-1 font-semibold">
            Your password
            <input
              type="password"
              autoComplete="current-password"
              value={password}
              onChange={(e) => setPassword(e.target.value)}
              className={input}
            />
          </label>
          <label className="flex flex-col gap-1 font-semibold">
            New PIN (6–12 digits)
            <input
              type="password"
              inputMode="numeric"
              autoComplete="off"
              value={next}
              onChange={(e) => setNext(e.target.value)}
              className={input}
            />
          </label>
          <label className="flex flex-col gap-1 font-semibold">
            PIN again
            <input
              type="password"
              inputMode="numeric"
              autoComplete="off"
              value={again}
              onChange={(e) => setAgain(e.target.value)}
              className={input}
            />
          </label>
          <Button
            variant="primary"
            onClick={() => void save()}
            disabled={busy}
            className="sm:col-span-3 sm:justify-self-start"
          >
            {busy ? "Saving…" : "Save PIN"}
          </Button>
        </div>
      )}
      {msg && (
        <div className="mt-3">
          <Notice tone={msg.tone} role={msg.tone === "danger" ? "alert" : "status"}>
            {msg.text}
          </Notice>
        </div>
      )}
    </Panel>
  );
}
