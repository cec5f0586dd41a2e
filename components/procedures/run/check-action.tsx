"use client";
// A check step: done with one tap, naming the second person present where the template asks for
// one: a user of the facility, or a visitor by name (the rule: lib/record/people.ts, which the
// server also holds).
import { useState } from "react";
import { Button } from "@/components/ui/button";
import { useUsers } from "@/lib/local/hooks";
import { secondPersonProblem, VISITOR_NAME_MAX, visitorEntry } from "@/lib/record/people";
import type { TemplateStep } from "@/lib/schemas/template";
import { type Ctx, errorText, type LocalStep, writeStep } from "./context";

export function CheckAction({
  step,
  s,
  ctx,
}: {
  step: Extract<TemplateStep, { kind: "check" }>;
  s: LocalStep;
  ctx: Ctx;
}) {
  const users = useUsers();
  const [second, setSecond] = useState("");
  const [visitor, setVisitor] = useState("");
  const [busy, setBusy] = useState(false);
  if (s.current.length && !step.secondPerson) return null;
  const others = (users ?? []).filter((u) => u.id !== ctx.me.id && u.active);
  const isVisitor = second === VISITOR_CHOICE;
  const secondPersonId = isVisitor ? (visitor.trim() ? visitorEntry(visitor) : "") : second;
  const problem = secondPersonId ? secondPersonProblem(secondPersonId, ctx.me.id, users ?? []) : null;
  return (
    <div className="flex flex-wrap items-end gap-3">
      {step.secondPerson && (
        <label className="flex min-w-64 flex-col gap-1 font-semibold">
          Second person present
          <select
            value={second}
            onChange={(e) => setSecond(e.target.value)}
            className="min-h-12 rounded-xl border-2 border-line bg-bg px-3 text-lg"
          >
            <option value="">Choose…</option>
            {others.map((u) => (
              <option key={u.id} value={u.id}>
                {u.name}
              </option>
            ))}
            <option value={VISITOR_CHOICE}>A visitor (not a user of the facility)…</option>
          </select>
        </label>
      )}
      {step.secondPerson && isVisitor && (
        <label className="flex min-w-64 flex-col gap-1 font-semibold">
          Visitor's full name
          <input
            value={visitor}
            maxLength={VISITOR_NAME_MAX}
            onChange={(e) => setVisitor(e.target.value)}
            className="min-h-12 rounded-xl border-2 border-line bg-bg px-3 text-lg"
          />
          <span className="text-sm font-normal text-muted">The auditor sees a visitor flagged on the record.</span>
        </label>
      )}
      {problem && <p className="basis-full font-semibold text-warn">{problem}</p>}
      <Button
        variant="primary"
        className="min-h-16 min-w-48 text-xl"
        disabled={busy || (step.secondPerson && !secondPersonId) || problem !== null}
        onClick={async () => {
          setBusy(true);
          try {
            await writeStep(ctx, { stepId: step.id, kind: "check", ...(secondPersonId ? { secondPersonId } : {}) });
          } catch (e) {
            ctx.onError(errorText(e));
          } finally {
            setBusy(false);
          }
        }}
      >
        ✓ Done
      </Button>
    </div>
  );
}

/** The choice in the second-person list that opens the visitor's name field (never an id: ids have no spaces). */
const VISITOR_CHOICE = "choose a visitor";
