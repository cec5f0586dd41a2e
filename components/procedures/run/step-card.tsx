"use client";
// One step of a run: its number, heading, status, text and problems; then what was recorded for
// it and what can be done now (or, folded, the last entry and a button to open it).
import { Button } from "@/components/ui/button";
import { Notice, Panel, Tag } from "@/components/ui/panel";
import { ROLE_LABEL } from "@/lib/auth/permissions";
import { formatDate } from "@/lib/format";
import type { StepState } from "@/lib/procedures/state";
import type { TemplateStep } from "@/lib/schemas/template";
import { describeEntry } from "../step-bits";
import type { Ctx, LocalStep } from "./context";
import { StepAction } from "./step-action";
import { StepEntries } from "./step-entries";

const STATUS_LABEL: Record<
  StepState["status"],
  { text: string; tone: "neutral" | "ok" | "warn" | "danger" | "accent" }
> = {
  todo: { text: "To do", tone: "neutral" },
  done: { text: "Done", tone: "ok" },
  flagged: { text: "Done · flagged", tone: "warn" },
  awaiting_signature: { text: "Awaiting signature", tone: "accent" },
  blocked: { text: "Waits for hold point", tone: "neutral" },
};

export function StepCard({
  s,
  ctx,
  total,
  compact = false,
  onOpen,
}: {
  s: LocalStep;
  ctx: Ctx;
  total: number;
  compact?: boolean;
  onOpen?: () => void;
}) {
  const st = STATUS_LABEL[s.status];
  const open = ctx.view.state.status === "open";
  return (
    <Panel
      data-step={s.step.id}
      data-status={s.status}
      aria-labelledby={`step-${s.step.id}`}
      className={`flex flex-col gap-3 border-2 ${s.status === "flagged" ? "border-warn" : "border-line"}`}
    >
      <div className="flex flex-wrap items-start justify-between gap-2">
        <h2 id={`step-${s.step.id}`} className="text-xl font-bold">
          <span className="num text-muted">
            {s.index + 1}/{total}
          </span>{" "}
          {stepHeading(s.step)}
        </h2>
        <Tag tone={st.tone}>{st.text}</Tag>
      </div>
      <p className="text-lg">{s.step.text}</p>
      {s.problems.map((p) => (
        <p key={p} className="font-semibold text-warn">
          ⚑ {p}
        </p>
      ))}
      {compact ? (
        <div className="flex flex-wrap items-center gap-2">
          <StepSummary s={s} names={ctx.names} />
          <Button onClick={onOpen} className="ml-auto">
            Open step
          </Button>
        </div>
      ) : (
        <>
          <StepEntries s={s} ctx={ctx} />
          {open && s.status !== "blocked" && <StepAction s={s} ctx={ctx} />}
          {open && s.status === "blocked" && (
            <Notice tone="neutral">This step waits for the hold point before it to be signed.</Notice>
          )}
        </>
      )}
    </Panel>
  );
}

function stepHeading(step: TemplateStep): string {
  switch (step.kind) {
    case "check":
      return step.secondPerson ? "Check (two people)" : "Check";
    case "reading":
      return step.quantity;
    case "hold":
      return `Hold point — ${ROLE_LABEL[step.role]} signs`;
    case "note":
      return "Note";
    case "photo":
      return "Photo";
    case "caution":
      return "Caution";
  }
}

function StepSummary({ s, names }: { s: LocalStep; names: Record<string, string> }) {
  const last = s.current.at(-1);
  if (!last) return <span className="text-muted">Nothing recorded yet.</span>;
  return (
    <span className="text-muted">
      {describeEntry(last.payload)} · {names[last.authorId] ?? last.authorId}, {formatDate(last.recordedAt)}
    </span>
  );
}
