"use client";
// What was recorded for a step, oldest first: replaced entries struck through, the send state of
// each, the correction of a reading, comments, photos and the signatures on each entry.
import { SignatureManifestation } from "@/components/signature/manifestation";
import { Tag } from "@/components/ui/panel";
import { formatDate } from "@/lib/format";
import { personLabel } from "@/lib/record/people";
import { describeEntry, Photo } from "../step-bits";
import type { Ctx, LocalStep } from "./context";
import { CorrectReading } from "./reading-action";

export function StepEntries({ s, ctx }: { s: LocalStep; ctx: Ctx }) {
  if (!s.history.length) return null;
  const sigs = ctx.view.state.signatures;
  return (
    <ul aria-label="Recorded for this step" className="flex flex-col gap-2">
      {s.history.map((e) => {
        const replaced = !s.current.includes(e);
        const p = e.payload;
        return (
          <li key={e.id} className={`rounded-xl border border-line p-3 ${replaced ? "opacity-60" : ""}`}>
            <div className="flex flex-wrap items-center gap-2">
              <span
                className={`text-lg ${replaced ? "line-through" : "font-semibold"} ${p.kind === "reading" && p.outOfRange ? "text-warn" : ""}`}
              >
                {p.kind === "reading" && p.outOfRange ? "⚑ " : ""}
                {describeEntry(p)}
              </span>
              {p.kind === "check" && p.secondPersonId && (
                <span className="text-muted">with {personLabel(p.secondPersonId, ctx.names)}</span>
              )}
              <span className="text-sm text-muted">
                {ctx.names[e.authorId] ?? e.authorId} · {formatDate(e.recordedAt)}
              </span>
              {e.sync === "pending" && <Tag tone="accent">Saved on this tablet</Tag>}
              {e.sync === "rejected" && <Tag tone="danger">Refused</Tag>}
              {p.kind === "reading" && !replaced && ctx.view.state.status === "open" && (
                <CorrectReading entry={e} ctx={ctx} />
              )}
            </div>
            {e.supersedes && <p className="text-sm text-warn">Correction: {e.reason}</p>}
            {p.kind === "reading" && p.comment && <p className="text-muted">{p.comment}</p>}
            {p.kind === "photo" && <Photo id={p.attachmentId} />}
            {sigs
              .filter((g) => g.signedEntryId === e.id)
              .map((g) => (
                <div key={g.entryId} className="mt-2">
                  <SignatureManifestation sig={g} />
                </div>
              ))}
          </li>
        );
      })}
    </ul>
  );
}
