"use client";
// A check step: done with one tap, naming the second person present where the template asks for one.
import { useState } from "react";
import { Button } from "@/components/ui/button";
import { useUsers } from "@/lib/local/hooks";
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
  const [busy, setBusy] = useState(false);
  if (s.current.length && !step.secondPerson) return null;
  const others = (users ?? []).filter((u) => u.id !== ctx.me.id && u.active);
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
          </select>
        </label>
      )}
      <Button
        variant="primary"
        className="min-h-16 min-w-48 text-xl"
        disabled={busy || (step.secondPerson && !second)}
        onClick={async () => {
          setBusy(true);
          try {
            await writeStep(ctx, { stepId: step.id, kind: "check", ...(second ? { secondPersonId: second } : {}) });
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
