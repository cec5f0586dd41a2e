"use client";
// A note step: free text, saved as the step's entry.
import { useState } from "react";
import { Button } from "@/components/ui/button";
import type { TemplateStep } from "@/lib/schemas/template";
import { type Ctx, errorText, writeStep } from "./context";

export function NoteAction({ step, ctx }: { step: Extract<TemplateStep, { kind: "note" }>; ctx: Ctx }) {
  const [text, setText] = useState("");
  const [busy, setBusy] = useState(false);
  return (
    <div className="flex flex-col gap-2">
      <label htmlFor={`${step.id}-note`} className="font-semibold">
        Note
      </label>
      <textarea
        id={`${step.id}-note`}
        value={text}
        onChange={(e) => setText(e.target.value)}
        rows={3}
        className="rounded-xl border-2 border-line bg-bg px-3 py-2 text-lg"
      />
      <Button
        variant="primary"
        className="min-h-14 self-start text-lg"
        disabled={busy || !text.trim()}
        onClick={async () => {
          setBusy(true);
          try {
            await writeStep(ctx, { stepId: step.id, kind: "note", text: text.trim() });
            setText("");
          } catch (e) {
            ctx.onError(errorText(e));
          } finally {
            setBusy(false);
          }
        }}
      >
        Save note
      </Button>
    </div>
  );
}
