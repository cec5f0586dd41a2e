"use client";
// Signing: who is signing and what it means are shown first, then the mark on the pad and the
// signer's secret (PIN on the tablet, or the password while online). Only after the secret checks
// out does the caller write the record and its signature (the image alone never signs).
import { type ReactNode, useRef, useState } from "react";
import { Button } from "@/components/ui/button";
import { Notice } from "@/components/ui/panel";
import { api, problemText } from "@/components/ui/use-json";
import { ROLE_LABEL } from "@/lib/auth/permissions";
import { meaningLabel } from "@/lib/format";
import type { SignatureMeaning } from "@/lib/schemas/entry";
import type { SessionUser } from "@/lib/schemas/user";
import type { ConfirmedBy, SigningSubject } from "@/lib/signing/proof";
import { cachedPin, pinProof, unlockPin } from "@/lib/signing/tablet";
import { type PadHandle, SignaturePad } from "./signature-pad";

export type Confirmation = {
  confirmedBy: ConfirmedBy;
  prove: (subject: SigningSubject) => Promise<string>;
  image: string;
};

async function passwordProof(password: string, subject: SigningSubject): Promise<string> {
  let body: { proof?: string };
  try {
    body = await api<{ proof?: string }>("/api/pin/confirm", {
      json: {
        password,
        signedEntryId: subject.signedEntryId,
        signedHash: subject.signedHash,
        meaning: subject.meaning,
      },
    });
  } catch (e) {
    throw new Error(
      problemText(e, "No connection to the server: signing with the password needs the network. Use your PIN."),
    );
  }
  if (!body.proof) throw new Error("The server's answer carried no confirmation; nothing was signed.");
  return body.proof;
}

export function SignDialog({
  me,
  meaning,
  title,
  children,
  onSign,
  onClose,
}: {
  me: SessionUser;
  meaning: SignatureMeaning;
  title: string;
  children?: ReactNode;
  /** Write the record(s) and the signature; throw to show the problem and keep the dialog open. */
  onSign: (c: Confirmation) => Promise<void>;
  onClose: () => void;
}) {
  const pad = useRef<PadHandle>(null);
  const hasPin = Boolean(cachedPin(me.id));
  const [mode, setMode] = useState<ConfirmedBy>(hasPin ? "pin" : "password");
  const [secret, setSecret] = useState("");
  const [empty, setEmpty] = useState(true);
  const [busy, setBusy] = useState(false);
  const [error, setError] = useState<string | null>(null);

  async function sign() {
    setError(null);
    if (pad.current?.isEmpty()) return setError("Draw your signature on the pad first.");
    if (!secret) return setError(mode === "pin" ? "Enter your signing PIN." : "Enter your password.");
    setBusy(true);
    try {
      let prove: Confirmation["prove"];
      if (mode === "pin") {
        const u = await unlockPin(me.id, secret);
        if (!u.ok) {
          setSecret("");
          const why = {
            no_pin: "No signing PIN on this tablet. Set one while online, or sign with your password.",
            expired: "The PIN on this tablet has expired. Connect to the network once, or sign with your password.",
            locked:
              "Too many wrong PINs: the PIN was removed from this tablet. Sign with your password while online, then set a PIN again.",
            wrong: `That PIN is not right. ${u.left ?? 0} attempt(s) left.`,
          }[u.reason];
          throw new Error(why);
        }
        const key = u.key;
        prove = async (s) => pinProof(key, s);
      } else {
        if (!navigator.onLine)
          throw new Error("Signing with the password needs the network. Use your PIN on this tablet.");
        const pw = secret;
        prove = (s) => passwordProof(pw, s);
      }
      await onSign({ confirmedBy: mode, prove, image: pad.current!.toPng() });
      onClose();
    } catch (e) {
      setError((e as Error).message);
    } finally {
      setBusy(false);
    }
  }

  return (
    <div className="fixed inset-0 z-50 flex items-start justify-center overflow-y-auto bg-black/50 p-4 no-print">
      <div
        role="dialog"
        aria-modal="true"
        aria-labelledby="sign-title"
        className="w-full max-w-2xl rounded-2xl border-2 border-line bg-panel p-5 shadow-xl"
      >
        <h2 id="sign-title" className="text-2xl font-bold">
          {title}
        </h2>
        <p className="mt-1 text-lg">
          Signing as <strong>{me.name}</strong> ({ROLE_LABEL[me.role]}) — meaning:{" "}
          <strong>{meaningLabel(meaning)}</strong>
        </p>
        {children && <div className="mt-2 rounded-xl bg-sunk p-3">{children}</div>}
        <div className="mt-4">
          <SignaturePad ref={pad} label="Signature pad" onChange={setEmpty} />
        </div>
        <div className="mt-4 flex flex-wrap gap-2" role="radiogroup" aria-label="Confirm your identity with">
          {(["pin", "password"] as const).map((m) => (
            <button
              key={m}
              type="button"
              role="radio"
              aria-checked={mode === m}
              onClick={() => {
                setMode(m);
                setSecret("");
              }}
              className={`min-h-12 rounded-xl border-2 px-4 font-semibold ${mode === m ? "border-accent bg-sunk" : "border-line"}`}
            >
              {m === "pin" ? "PIN on this tablet" : "Password (online)"}
            </button>
          ))}
        </div>
        <label htmlFor="sign-secret" className="mt-3 block font-semibold">
          {mode === "pin" ? "Signing PIN" : "Password"}
        </label>
        <input
          id="sign-secret"
          type="password"
          inputMode={mode === "pin" ? "numeric" : "text"}
          autoComplete={mode === "pin" ? "off" : "current-password"}
          value={secret}
          onChange={(e) => setSecret(e.target.value)}
          onKeyDown={(e) => e.key === "Enter" && void sign()}
          className="num mt-1 w-full rounded-xl border-2 border-line bg-bg px-4 py-3 text-2xl tracking-widest"
        />
        {mode === "pin" && !hasPin && (
          <p className="mt-1 text-sm text-warn">
            No PIN is set on this tablet for you (set it on the Procedures page while online).
          </p>
        )}
        {error && (
          <div className="mt-3">
            <Notice tone="danger" role="alert">
              {error}
            </Notice>
          </div>
        )}
        <div className="mt-4 flex flex-wrap justify-end gap-2">
          <Button onClick={onClose} disabled={busy}>
            Cancel
          </Button>
          <Button variant="primary" onClick={() => void sign()} disabled={busy || empty}>
            {busy ? "Signing…" : `Sign: ${meaningLabel(meaning)}`}
          </Button>
        </div>
      </div>
    </div>
  );
}
