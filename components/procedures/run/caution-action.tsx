"use client";
// A caution step: the safety caution that fits it, acknowledged as read.
import { useState } from "react";
import { Caution } from "@/components/safety/caution";
import { Button } from "@/components/ui/button";
import { useCryostat } from "@/lib/local/hooks";
import type { TemplateStep } from "@/lib/schemas/template";
import { type Ctx, errorText, writeStep } from "./context";

/** Which of the safety engineer's caution topics fits a template's caution step. */
export function cautionTopicFor(templateKey: string, topic: Extract<TemplateStep, { kind: "caution" }>["topic"]) {
  switch (topic) {
    case "cryogen":
      return "cold" as const;
    case "oxygen":
      return "oxygen" as const;
    case "transfer_line":
      return "transfer" as const;
    case "magnet":
      return "ramp" as const;
    default:
      return templateKey.startsWith("warmup") ? ("warmup" as const) : ("cooldown" as const);
  }
}

export function CautionAction({ step, ctx }: { step: Extract<TemplateStep, { kind: "caution" }>; ctx: Ctx }) {
  const cryostat = useCryostat(ctx.cryostatId);
  const [busy, setBusy] = useState(false);
  return (
    <div className="flex flex-col gap-3">
      <Caution
        topic={cautionTopicFor(ctx.view.template.key, step.topic)}
        cryostatId={ctx.cryostatId}
        cryostatName={cryostat?.name ?? ctx.cryostatId}
      />
      <Button
        variant="primary"
        className="min-h-16 self-start text-xl"
        disabled={busy}
        onClick={async () => {
          setBusy(true);
          try {
            await writeStep(ctx, { stepId: step.id, kind: "caution", acknowledged: true });
          } catch (e) {
            ctx.onError(errorText(e));
          } finally {
            setBusy(false);
          }
        }}
      >
        I have read this caution
      </Button>
    </div>
  );
}
