// How one log entry reads on screen, per kind. Shared by the logbook, run records and audit.

import type { ReactNode } from "react";
import { formatDate, formatTemperature, meaningLabel, stateLabel, trim } from "@/lib/format";
import { describeEntry } from "@/lib/procedures/describe";
import type { EntryFields, EntryKind, Payload, StoredEntry } from "@/lib/schemas/entry";

const num = (v: unknown) => (typeof v === "number" ? trim(v) : "—");

type Names = Record<string, string>;
/** How one kind's payload reads. One per kind: a kind without one is a type error. */
type Bodies = { [K in EntryKind]: (p: Payload<K>, names: Names) => ReactNode };

const raw = (p: unknown) => <pre className="overflow-x-auto text-sm">{JSON.stringify(p, null, 1)}</pre>;

const BODIES: Bodies = {
  note: (p) => <p className="whitespace-pre-wrap">{p.text}</p>,
  reading: (p) => (
    <p>
      {p.quantity}
      {p.stage ? <span className="text-muted"> · {p.stage}</span> : null}:{" "}
      <span className="num font-semibold">
        {p.unit === "K" || p.unit === "mK" ? formatTemperature(Number(p.value), p.unit) : `${num(p.value)} ${p.unit}`}
      </span>
      {p.comment ? <span className="block text-muted">{p.comment}</span> : null}
    </p>
  ),
  "helium.level": (p) => (
    <p>
      Helium level <span className="num font-semibold">{num(p.percent)} %</span>
      {typeof p.litres === "number" ? <span className="num"> ({trim(p.litres)} L)</span> : null}
    </p>
  ),
  "field.setting": (p) => (
    <p>
      <span className="num font-semibold">{num(p.fieldT)} T</span> at <span className="num">{num(p.currentA)} A</span>,{" "}
      {p.persistent ? "persistent mode" : "driven by the supply"}
      {typeof p.rampRateTPerMin === "number" ? (
        <span className="num">, ramped at {trim(p.rampRateTPerMin)} T/min</span>
      ) : null}
      {p.comment ? <span className="block text-muted">{p.comment}</span> : null}
    </p>
  ),
  state: (p) => (
    <p>
      Now <span className="font-semibold">{stateLabel(p.state)}</span>
      {p.comment ? <span className="block text-muted">{p.comment}</span> : null}
    </p>
  ),
  handover: (p, names) => (
    <p>
      Handed over{p.toUserId ? ` to ${names[p.toUserId] ?? p.toUserId}` : ""}:{" "}
      <span className="whitespace-pre-wrap">{p.note}</span>
    </p>
  ),
  transfer: (p) => (
    <p>
      From {p.supplyDewar}: level{" "}
      <span className="num">
        {num(p.levelBeforePercent)} → {num(p.levelAfterPercent)} %
      </span>
      , gained <span className="num">{num(p.gainedLitres)} L</span> of{" "}
      <span className="num">{num(p.suppliedLitres)} L</span> taken; {p.peoplePresent.length} present
      {typeof p.oxygenLowestPercent === "number" ? (
        <span className="num">, oxygen ≥ {trim(p.oxygenLowestPercent)} %</span>
      ) : (
        <span className="text-warn">, no oxygen reading</span>
      )}
    </p>
  ),
  quench: (p) => (
    <p>
      Quench at <span className="num font-semibold">{num(p.fieldT)} T</span>
      {typeof p.heliumLostLitres === "number" ? (
        <span className="num">, ≈ {trim(p.heliumLostLitres)} L helium lost</span>
      ) : null}
      <span className="block text-muted">{p.actions}</span>
    </p>
  ),
  incident: (p) => (
    <p>
      <span className="font-semibold">{p.title}</span> — {p.description}
    </p>
  ),
  signature: (p) => (
    <p>
      <span className="font-semibold">{meaningLabel(p.meaning)}</span> by {p.signerName} (
      {p.signerRole.replace("_", " ")})
    </p>
  ),
  "rules.change": (p) => (
    <p>
      Facility rules version <span className="num font-semibold">{num(p.version)}</span>:{" "}
      {p.changes.map((c) => c.field).join(", ") || "rules document"}
      <span className="block text-muted">{p.reason}</span>
    </p>
  ),
  "audit.finding": (p) => (
    <p>
      Audit: <span className="font-semibold">{p.verdict === "acceptable" ? "acceptable" : "needs action"}</span> —{" "}
      {p.findings}
    </p>
  ),
  "run.start": (p) => (
    <p>
      Started <span className="font-semibold">{p.title}</span>{" "}
      <span className="text-muted">(procedure version {num(p.templateVersion)})</span>
    </p>
  ),
  "run.step": (p) => <p>{describeEntry(p)}</p>,
  "run.abort": (p) => <p>Aborted: {p.reason}</p>,
  "run.complete": (p) => <p>Procedure completed{p.comment ? `: ${p.comment}` : ""}</p>,
  // A facility-wide record with no reading of its own yet: shown as it was written.
  "user.change": raw,
};

/** One entry's body, its kind's renderer handed that kind's payload. */
function bodyOf<K extends EntryKind>(kind: K, payload: Payload<K>, names: Names): ReactNode {
  const render: Bodies[K] | undefined = BODIES[kind];
  // A kind this build does not know (written by a newer version) reads as its raw payload.
  return render ? render(payload, names) : raw(payload);
}

export function EntryBody({ entry, names = {} }: { entry: EntryFields<never>; names?: Names }) {
  return bodyOf(entry.kind, entry.payload, names);
}

export function EntryMeta({
  entry,
  names,
}: {
  entry: Pick<StoredEntry, "recordedAt" | "authorId" | "kind">;
  names: Record<string, string>;
}) {
  return (
    <span className="text-sm text-muted">
      {formatDate(entry.recordedAt)} · {names[entry.authorId] ?? entry.authorId}
    </span>
  );
}
