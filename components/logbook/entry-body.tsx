// How one log entry reads on screen, per kind. Shared by the logbook, run records and audit.

import { formatDate, formatTemperature, meaningLabel, stateLabel, trim } from "@/lib/format";
import { describeEntry } from "@/lib/procedures/describe";
import type { StoredEntry } from "@/lib/schemas/entry";
import type { RunStepPayload } from "@/lib/schemas/run";

type P = Record<string, unknown>;
const num = (v: unknown) => (typeof v === "number" ? trim(v) : "—");

export function EntryBody({
  entry,
  names = {},
}: {
  entry: Pick<StoredEntry, "kind" | "payload">;
  names?: Record<string, string>;
}) {
  const p = entry.payload as P;
  switch (entry.kind) {
    case "note":
      return <p className="whitespace-pre-wrap">{String(p.text)}</p>;
    case "reading":
      return (
        <p>
          {String(p.quantity)}
          {p.stage ? <span className="text-muted"> · {String(p.stage)}</span> : null}:{" "}
          <span className="num font-semibold">
            {p.unit === "K" || p.unit === "mK"
              ? formatTemperature(Number(p.value), String(p.unit))
              : `${num(p.value)} ${String(p.unit)}`}
          </span>
          {p.comment ? <span className="block text-muted">{String(p.comment)}</span> : null}
        </p>
      );
    case "helium.level":
      return (
        <p>
          Helium level <span className="num font-semibold">{num(p.percent)} %</span>
          {typeof p.litres === "number" ? <span className="num"> ({trim(p.litres)} L)</span> : null}
        </p>
      );
    case "field.setting":
      return (
        <p>
          <span className="num font-semibold">{num(p.fieldT)} T</span> at{" "}
          <span className="num">{num(p.currentA)} A</span>, {p.persistent ? "persistent mode" : "driven by the supply"}
          {typeof p.rampRateTPerMin === "number" ? (
            <span className="num">, ramped at {trim(p.rampRateTPerMin)} T/min</span>
          ) : null}
          {p.comment ? <span className="block text-muted">{String(p.comment)}</span> : null}
        </p>
      );
    case "state":
      return (
        <p>
          Now <span className="font-semibold">{stateLabel(String(p.state))}</span>
          {p.comment ? <span className="block text-muted">{String(p.comment)}</span> : null}
        </p>
      );
    case "handover":
      return (
        <p>
          Handed over{p.toUserId ? ` to ${names[String(p.toUserId)] ?? String(p.toUserId)}` : ""}:{" "}
          <span className="whitespace-pre-wrap">{String(p.note)}</span>
        </p>
      );
    case "transfer":
      return (
        <p>
          From {String(p.supplyDewar)}: level{" "}
          <span className="num">
            {num(p.levelBeforePercent)} → {num(p.levelAfterPercent)} %
          </span>
          , gained <span className="num">{num(p.gainedLitres)} L</span> of{" "}
          <span className="num">{num(p.suppliedLitres)} L</span> taken; {(p.peoplePresent as string[]).length} present
          {typeof p.oxygenLowestPercent === "number" ? (
            <span className="num">, oxygen ≥ {trim(p.oxygenLowestPercent)} %</span>
          ) : (
            <span className="text-warn">, no oxygen reading</span>
          )}
        </p>
      );
    case "quench":
      return (
        <p>
          Quench at <span className="num font-semibold">{num(p.fieldT)} T</span>
          {typeof p.heliumLostLitres === "number" ? (
            <span className="num">, ≈ {trim(p.heliumLostLitres)} L helium lost</span>
          ) : null}
          <span className="block text-muted">{String(p.actions)}</span>
        </p>
      );
    case "incident":
      return (
        <p>
          <span className="font-semibold">{String(p.title)}</span> — {String(p.description)}
        </p>
      );
    case "signature":
      return (
        <p>
          <span className="font-semibold">{meaningLabel(String(p.meaning))}</span> by {String(p.signerName)} (
          {String(p.signerRole).replace("_", " ")})
        </p>
      );
    case "rules.change":
      return (
        <p>
          Facility rules version <span className="num font-semibold">{num(p.version)}</span>:{" "}
          {((p.changes as { field: string }[] | undefined) ?? []).map((c) => c.field).join(", ") || "rules document"}
          <span className="block text-muted">{String(p.reason)}</span>
        </p>
      );
    case "audit.finding":
      return (
        <p>
          Audit: <span className="font-semibold">{p.verdict === "acceptable" ? "acceptable" : "needs action"}</span> —{" "}
          {String(p.findings)}
        </p>
      );
    case "run.start":
      return (
        <p>
          Started <span className="font-semibold">{String(p.title)}</span>{" "}
          <span className="text-muted">(procedure version {num(p.templateVersion)})</span>
        </p>
      );
    case "run.step":
      return <p>{describeEntry(p as unknown as RunStepPayload)}</p>;
    case "run.abort":
      return <p>Aborted: {String(p.reason)}</p>;
    case "run.complete":
      return <p>Procedure completed{p.comment ? `: ${String(p.comment)}` : ""}</p>;
    default:
      return <pre className="overflow-x-auto text-sm">{JSON.stringify(p, null, 1)}</pre>;
  }
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
