"use client";
// "My account": change your own password (the current one is needed). After an admin's reset this
// is the one screen open until the new password is chosen; then the session's token is refreshed
// (GET /api/auth/session) so the page guard lets the other screens through again.
import { useState } from "react";
import { Button } from "@/components/ui/button";
import { TextField } from "@/components/ui/field";
import { Notice, Panel } from "@/components/ui/panel";
import { ApiError, api, problemText } from "@/components/ui/use-json";

type Fields = Partial<Record<"currentPassword" | "newPassword" | "repeat", string>>;

export function PasswordForm({ mustChange = false }: { mustChange?: boolean }) {
  const [errors, setErrors] = useState<Fields>({});
  const [message, setMessage] = useState<{ tone: "ok" | "danger"; text: string } | null>(null);
  const [busy, setBusy] = useState(false);

  const submit = async (ev: React.FormEvent<HTMLFormElement>) => {
    ev.preventDefault();
    const form = new FormData(ev.currentTarget);
    const currentPassword = String(form.get("currentPassword") ?? "");
    const newPassword = String(form.get("newPassword") ?? "");
    const repeat = String(form.get("repeat") ?? "");
    setMessage(null);
    const local: Fields = {};
    if (!currentPassword) local.currentPassword = "Enter your current password.";
    if (!newPassword) local.newPassword = "Enter a new password.";
    else if (repeat !== newPassword) local.repeat = "The two new passwords differ.";
    setErrors(local);
    if (Object.keys(local).length) return;
    setBusy(true);
    try {
      await api("/api/account/password", { json: { currentPassword, newPassword } });
      await fetch("/api/auth/session", { cache: "no-store", credentials: "same-origin" });
      setMessage({ tone: "ok", text: "Your password is changed. Your other sessions have ended." });
      ev.currentTarget?.reset();
      if (mustChange) window.location.assign("/");
    } catch (e) {
      if (e instanceof ApiError && e.fields.length) {
        setErrors(Object.fromEntries(e.fields.map((f) => [f.path, f.message])) as Fields);
      }
      setMessage({ tone: "danger", text: problemText(e, "No connection to the server: nothing was changed.") });
    } finally {
      setBusy(false);
    }
  };

  return (
    <Panel className="max-w-xl">
      <h2 className="mb-3 text-xl font-bold">Change your password</h2>
      {mustChange && (
        <Notice tone="danger" title="Your password was reset: choose a new one before anything else." role="alert" />
      )}
      <form onSubmit={(ev) => void submit(ev)} className="mt-3 flex flex-col gap-3" noValidate>
        <TextField
          label="Current password"
          name="currentPassword"
          type="password"
          autoComplete="current-password"
          error={errors.currentPassword}
        />
        <TextField
          label="New password"
          name="newPassword"
          type="password"
          autoComplete="new-password"
          error={errors.newPassword}
          hint="At least 10 characters. A few unrelated words work well; common passwords are refused."
        />
        <TextField
          label="New password again"
          name="repeat"
          type="password"
          autoComplete="new-password"
          error={errors.repeat}
        />
        {message && (
          <Notice tone={message.tone} title={message.text} role={message.tone === "danger" ? "alert" : "status"} />
        )}
        <Button type="submit" variant="primary" disabled={busy}>
          {busy ? "Changing…" : "Change password"}
        </Button>
      </form>
    </Panel>
  );
}
