"use client";
// The facility admin's list of registered tablets: when each was last seen, who signed in on it,
// how many entries it said were waiting, and whether it was withdrawn (when, by whom, why); and
// withdrawing one, with a reason and a second tap to confirm.
import { useCallback, useEffect, useState } from "react";
import { Button } from "@/components/ui/button";
import { TextField } from "@/components/ui/field";
import { Loading, Notice, Panel, Tag } from "@/components/ui/panel";
import { api, problemText } from "@/components/ui/use-json";
import { formatDate, formatWhen } from "@/lib/format";
import type { DeviceView } from "@/lib/schemas/device";

export function DevicesAdmin() {
  const [devices, setDevices] = useState<DeviceView[] | null>(null);
  const [error, setError] = useState<string | null>(null);
  const refresh = useCallback(async () => {
    try {
      setDevices((await api<{ devices: DeviceView[] }>("/api/devices")).devices);
      setError(null);
    } catch (e) {
      setError(problemText(e));
    }
  }, []);
  useEffect(() => {
    void refresh();
  }, [refresh]);

  return (
    <div className="flex flex-col gap-4">
      <p className="text-base text-muted">
        A tablet is registered when someone signs in on it online; everyone who signs in on it is listed. A withdrawn
        tablet can send nothing more: its entries are refused and it cannot register again. What it holds stays on it.
      </p>
      {error && <Notice tone="danger" title={error} role="alert" />}
      {!devices && !error && <Loading />}
      {devices?.length === 0 && <Notice title="No tablet has registered yet." />}
      <ul className="flex flex-col gap-3">
        {devices?.map((d) => (
          <li key={d.id}>
            <DeviceCard device={d} onChanged={refresh} />
          </li>
        ))}
      </ul>
    </div>
  );
}

function DeviceCard({ device: d, onChanged }: { device: DeviceView; onChanged: () => Promise<void> }) {
  const [open, setOpen] = useState(false);
  return (
    <Panel data-testid="device-card" data-device={d.id}>
      <div className="flex flex-wrap items-start justify-between gap-3">
        <div>
          <p className="num text-lg font-semibold">{d.id}</p>
          <p className="text-muted">
            Last seen {formatWhen(d.lastSeenAt)} · first seen {formatDate(d.firstSeenAt)}
          </p>
        </div>
        {d.revoked ? (
          <Tag tone="danger">withdrawn</Tag>
        ) : d.registered ? (
          <Tag tone="ok">registered</Tag>
        ) : (
          <Tag tone="warn">not yet registered (older app)</Tag>
        )}
      </div>
      <dl className="mt-3 grid grid-cols-[auto_1fr] gap-x-4 gap-y-1">
        <dt className="text-muted">Signed in on it</dt>
        <dd>{d.users.length ? d.users.map((u) => u.name).join(", ") : "nobody yet"}</dd>
        <dt className="text-muted">Waiting to send</dt>
        <dd className="num">
          {d.pendingCount === null
            ? "not known"
            : `${d.pendingCount} ${d.pendingCount === 1 ? "entry" : "entries"} (${formatWhen(d.pendingAt ?? d.lastSeenAt)})`}
        </dd>
        {d.revoked && (
          <>
            <dt className="text-muted">Withdrawn</dt>
            <dd>
              {formatDate(d.revoked.at)} by {d.revoked.byName ?? d.revoked.by ?? "unknown"}: {d.revoked.reason}
            </dd>
          </>
        )}
      </dl>
      {!d.revoked && !open && (
        <Button variant="danger" className="mt-3" onClick={() => setOpen(true)}>
          Withdraw this tablet…
        </Button>
      )}
      {!d.revoked && open && <RevokeForm device={d} onDone={onChanged} onCancel={() => setOpen(false)} />}
    </Panel>
  );
}

function RevokeForm({
  device,
  onDone,
  onCancel,
}: {
  device: DeviceView;
  onDone: () => Promise<void>;
  onCancel: () => void;
}) {
  const [reason, setReason] = useState("");
  const [confirming, setConfirming] = useState(false);
  const [busy, setBusy] = useState(false);
  const [error, setError] = useState<string | null>(null);
  const tooShort = reason.trim().length < 3;

  const revoke = async () => {
    setBusy(true);
    setError(null);
    try {
      await api(`/api/devices/${encodeURIComponent(device.id)}/revoke`, { json: { reason } });
      await onDone();
    } catch (e) {
      setError(problemText(e, "No connection to the server: the tablet was NOT withdrawn."));
      setConfirming(false);
    } finally {
      setBusy(false);
    }
  };

  return (
    <div className="mt-3 flex flex-col gap-3 rounded-xl border-2 border-danger p-3">
      <TextField
        label="Why is it withdrawn?"
        name={`reason-${device.id}`}
        value={reason}
        onChange={(e) => {
          setReason(e.target.value);
          setConfirming(false);
        }}
        hint="For example: lost, broken, left the facility. Kept with the tablet's record."
        autoComplete="off"
      />
      {error && <Notice tone="danger" title={error} role="alert" />}
      {confirming && (
        <Notice tone="danger" role="alert" title="Withdraw for good?">
          Entries from this tablet will be refused from now on, and it cannot register again. This cannot be undone
          here.
        </Notice>
      )}
      <div className="flex flex-wrap gap-2">
        {confirming ? (
          <Button variant="danger" disabled={busy} onClick={() => void revoke()}>
            {busy ? "Withdrawing…" : "Yes, withdraw it"}
          </Button>
        ) : (
          <Button variant="danger" disabled={tooShort} onClick={() => setConfirming(true)}>
            Withdraw
          </Button>
        )}
        <Button onClick={onCancel} disabled={busy}>
          Cancel
        </Button>
      </div>
    </div>
  );
}
