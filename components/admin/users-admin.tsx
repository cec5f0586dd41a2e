"use client";
// The facility admin's list of people with their roles, the form to add one, and per person:
// end their sessions, reset their password (they must choose a new one at their next sign-in).
import { zodResolver } from "@hookform/resolvers/zod";
import { useCallback, useEffect, useState } from "react";
import { useForm } from "react-hook-form";
import { syncSoon } from "@/components/sync/runtime";
import { Button } from "@/components/ui/button";
import { SelectField, TextField } from "@/components/ui/field";
import { OptionList, TableHead } from "@/components/ui/form";
import { Loading, Notice, Panel, Tag } from "@/components/ui/panel";
import { ApiError, api, problemText } from "@/components/ui/use-json";
import { ROLE_LABEL } from "@/lib/auth/permissions";
import type { AdminUser } from "@/lib/schemas/user";
import { type NewUser, newUserSchema } from "@/lib/schemas/user";

const ROLE_OPTIONS = Object.entries(ROLE_LABEL).map(([value, label]) => ({ value, label }));

export function UsersAdmin() {
  const [users, setUsers] = useState<AdminUser[] | null>(null);
  const [error, setError] = useState<string | null>(null);
  const refresh = useCallback(async () => {
    try {
      setUsers((await api<{ users: AdminUser[] }>("/api/users")).users);
    } catch (e) {
      setError(problemText(e));
    }
  }, []);
  useEffect(() => {
    void refresh();
  }, [refresh]);

  const change = async (u: AdminUser, body: { role?: AdminUser["role"]; active?: boolean }) => {
    setError(null);
    try {
      await api(`/api/users/${encodeURIComponent(u.id)}`, { method: "PATCH", json: body });
    } catch (e) {
      setError(problemText(e, "No connection to the server: nothing was changed."));
      if (e instanceof ApiError && e.offline) return;
    }
    syncSoon(); // names on this tablet come from its store
    await refresh();
  };

  const [notice, setNotice] = useState<string | null>(null);
  const [resetFor, setResetFor] = useState<string | null>(null);
  const endSessions = async (u: AdminUser) => {
    setError(null);
    setNotice(null);
    try {
      const { ended } = await api<{ ended: number }>(`/api/users/${encodeURIComponent(u.id)}/sessions`, { json: {} });
      setNotice(`${u.name}: ${ended} ${ended === 1 ? "session" : "sessions"} ended.`);
    } catch (e) {
      setError(problemText(e, "No connection to the server: nothing was changed."));
    }
  };
  const resetPassword = async (u: AdminUser, password: string) => {
    setError(null);
    setNotice(null);
    try {
      await api(`/api/users/${encodeURIComponent(u.id)}/password`, { json: { password } });
      setNotice(`${u.name} signs in with the new password and must then choose their own.`);
      setResetFor(null);
    } catch (e) {
      setError(problemText(e, "No connection to the server: nothing was changed.", true));
    }
  };

  return (
    <div className="grid gap-4 lg:grid-cols-[1fr_22rem]">
      <Panel className="p-0">
        {error && <Notice tone="danger" title={error} role="alert" />}
        {notice && <Notice tone="ok" title={notice} role="status" />}
        <p className="px-5 pt-4 text-base text-muted">
          A change of role or access ends that person&apos;s sessions and is kept on the audit trail.
        </p>
        {!users && !error && <Loading />}
        {users && (
          <table className="w-full text-left">
            <caption className="sr-only">People with access to Rimelog</caption>
            <TableHead cell="px-5 py-3" columns={["Name", "Email", "Role", "Access", "Sign-in"]} />
            <tbody>
              {users.map((u) => (
                <tr key={u.id} className="border-t border-line">
                  <td className="px-5 py-3 font-semibold">{u.name}</td>
                  <td className="px-5 py-3">{u.email}</td>
                  <td className="px-5 py-3">
                    <label className="sr-only" htmlFor={`role-${u.id}`}>
                      Role of {u.name}
                    </label>
                    <select
                      id={`role-${u.id}`}
                      value={u.role}
                      onChange={(ev) => void change(u, { role: ev.target.value as AdminUser["role"] })}
                      className="min-h-12 rounded-xl border-2 border-line bg-bg px-3"
                    >
                      <OptionList options={ROLE_OPTIONS} />
                    </select>
                  </td>
                  <td className="px-5 py-3">
                    {u.active ? <Tag tone="ok">active</Tag> : <Tag tone="danger">disabled</Tag>}
                    <Button className="ml-2" onClick={() => void change(u, { active: !u.active })}>
                      {u.active ? "Disable" : "Enable"}
                    </Button>
                  </td>
                  <td className="px-5 py-3">
                    <div className="flex flex-wrap gap-2">
                      <Button onClick={() => void endSessions(u)}>End sessions</Button>
                      <Button onClick={() => setResetFor(resetFor === u.id ? null : u.id)}>Reset password</Button>
                    </div>
                    {resetFor === u.id && (
                      <form
                        className="mt-2 flex flex-col gap-2"
                        onSubmit={(ev) => {
                          ev.preventDefault();
                          void resetPassword(u, String(new FormData(ev.currentTarget).get("password") ?? ""));
                        }}
                      >
                        <TextField
                          label={`First password for ${u.name}`}
                          id={`reset-${u.id}`}
                          name="password"
                          type="password"
                          autoComplete="new-password"
                          hint="Hand it over in person; they must change it when they sign in."
                        />
                        <Button type="submit" variant="primary">
                          Set and end their sessions
                        </Button>
                      </form>
                    )}
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        )}
      </Panel>
      <AddUserForm onAdded={refresh} />
    </div>
  );
}

function AddUserForm({ onAdded }: { onAdded: () => Promise<void> }) {
  const [message, setMessage] = useState<{ tone: "ok" | "danger"; text: string } | null>(null);
  const {
    register,
    handleSubmit,
    reset,
    formState: { errors, isSubmitting },
  } = useForm<NewUser>({ resolver: zodResolver(newUserSchema), defaultValues: { role: "technician" } });

  const submit = handleSubmit(async (data) => {
    setMessage(null);
    let added: { user: { name: string } };
    try {
      added = await api<{ user: { name: string } }>("/api/users", { json: data });
    } catch (e) {
      setMessage({
        tone: "danger",
        text: problemText(e, "No connection to the server: the person was not added.", true),
      });
      return;
    }
    setMessage({ tone: "ok", text: `${added.user.name} can now sign in.` });
    reset({ role: data.role, name: "", email: "", password: "" });
    syncSoon();
    await onAdded();
  });

  return (
    <Panel>
      <h2 className="mb-3 text-xl font-bold">Add a person</h2>
      <form onSubmit={submit} className="flex flex-col gap-3" noValidate>
        <TextField label="Full name" {...register("name")} error={errors.name?.message} autoComplete="off" />
        <TextField
          label="Email address"
          type="email"
          {...register("email")}
          error={errors.email?.message}
          autoComplete="off"
        />
        <SelectField label="Role" {...register("role")} error={errors.role?.message} options={ROLE_OPTIONS} />
        <TextField
          label="First password"
          type="password"
          {...register("password")}
          error={errors.password?.message}
          hint="At least 10 characters, not a common one; they can change it under My account."
          autoComplete="new-password"
        />
        {message && (
          <Notice tone={message.tone} title={message.text} role={message.tone === "danger" ? "alert" : "status"} />
        )}
        <Button type="submit" variant="primary" disabled={isSubmitting}>
          {isSubmitting ? "Adding…" : "Add person"}
        </Button>
      </form>
    </Panel>
  );
}
