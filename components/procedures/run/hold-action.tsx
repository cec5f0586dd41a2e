"use client";
// A hold point: released by a signature of the role the template names; the steps after it wait.
import { useState } from "react";
import { SignDialog } from "@/components/signature/sign-dialog";
import { writeSignature } from "@/components/signature/write-signature";
import { Button } from "@/components/ui/button";
import { Notice } from "@/components/ui/panel";
import { ROLE_LABEL } from "@/lib/auth/permissions";
import type { TemplateStep } from "@/lib/schemas/template";
import { type Ctx, type LocalStep, writeStep } from "./context";

export function HoldAction({
  step,
  s,
  ctx,
}: {
  step: Extract<TemplateStep, { kind: "hold" }>;
  s: LocalStep;
  ctx: Ctx;
}) {
  const [signing, setSigning] = useState(false);
  if (ctx.me.role !== step.role) {
    return (
      <Notice tone="accent" title={`Needs a ${ROLE_LABEL[step.role].toLowerCase()}'s signature`}>
        A {ROLE_LABEL[step.role].toLowerCase()} signs this hold point on their own tablet, or here after signing in. The
        steps after it wait until then.
      </Notice>
    );
  }
  // A hold record written earlier whose signature did not go through is signed as it is.
  const unsigned = s.current.find((e) => !ctx.view.state.signatures.some((g) => g.valid && g.signedEntryId === e.id));
  return (
    <>
      <Button variant="primary" className="min-h-16 self-start text-xl" onClick={() => setSigning(true)}>
        ✍ Sign hold point
      </Button>
      {signing && (
        <SignDialog
          me={ctx.me}
          meaning="verified"
          title="Sign the hold point"
          onClose={() => setSigning(false)}
          onSign={async (c) => {
            const target = unsigned ?? (await writeStep(ctx, { stepId: step.id, kind: "hold", statement: step.text }));
            await writeSignature(target, ctx.me, "verified", c);
          }}
        >
          <p>{step.text}</p>
        </SignDialog>
      )}
    </>
  );
}
