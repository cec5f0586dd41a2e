"use client";
// A reading step: the value on a big keypad, checked against the pinned range as it is typed,
// the derived figure, a comment (required when out of range); and the correction of a reading.
import { useState } from "react";
import { DerivedValue } from "@/components/cryo/derived-value";
import { SignDialog } from "@/components/signature/sign-dialog";
import { recordAndSign } from "@/components/signature/write-signature";
import { Button } from "@/components/ui/button";
import { Notice } from "@/components/ui/panel";
import { useCryostat } from "@/lib/local/hooks";
import type { StoredLocalEntry } from "@/lib/local/record";
import { describeRange, readingOutOfRange } from "@/lib/procedures/state";
import type { TemplateStep } from "@/lib/schemas/template";
import { Keypad, keypadNumber } from "../keypad";
import { type Ctx, errorText, stepDraft, writeStep } from "./context";

export function ReadingAction({
  step,
  ctx,
  correcting,
  onDone,
}: {
  step: Extract<TemplateStep, { kind: "reading" }>;
  ctx: Ctx;
  correcting?: StoredLocalEntry;
  onDone?: () => void;
}) {
  const cryostat = useCryostat(ctx.cryostatId);
  const [value, setValue] = useState("");
  const [comment, setComment] = useState("");
  const [reason, setReason] = useState("");
  const [busy, setBusy] = useState(false);
  const [signing, setSigning] = useState(false);
  // Someone else's reading is corrected only with the corrector's signature, written with it
  // (lib/record/rules.ts correctionRefusal; the server refuses it otherwise).
  const othersReading = Boolean(correcting && correcting.authorId !== ctx.me.id);
  const n = keypadNumber(value);
  const out = n === null ? null : readingOutOfRange(step, n);
  const needsComment = out !== null && !comment.trim();
  const id = `${step.id}-${correcting ? "fix" : "value"}`;
  const payloadOf = (v: number) => ({
    stepId: step.id,
    kind: "reading" as const,
    quantity: step.quantity,
    value: v,
    unit: step.unit,
    outOfRange: out !== null,
    ...(comment.trim() ? { comment: comment.trim() } : {}),
  });
  const done = () => {
    setValue("");
    setComment("");
    setReason("");
    onDone?.();
  };
  return (
    <div className="grid gap-4 md:grid-cols-[1fr_minmax(16rem,22rem)]">
      <div className="flex flex-col gap-3">
        <label htmlFor={id} className="font-semibold">
          {correcting ? "Corrected value" : "Value"} in {step.unit}{" "}
          <span className="font-normal text-muted">(acceptable: {describeRange(step)})</span>
        </label>
        <div className="flex items-center gap-2">
          <input
            id={id}
            inputMode="decimal"
            autoComplete="off"
            value={value}
            onChange={(e) => setValue(e.target.value.replace(",", ".").replace(/[^0-9.-]/g, ""))}
            aria-invalid={out !== null}
            aria-describedby={`${id}-check ${id}-derived`}
            className={`num w-full rounded-xl border-2 bg-bg px-4 py-3 text-4xl ${out ? "border-warn" : "border-line"}`}
          />
          <span className="num text-2xl font-semibold">{step.unit}</span>
        </div>
        <p
          id={`${id}-check`}
          role="status"
          className={`text-lg font-semibold ${out ? "text-warn" : n !== null ? "text-ok" : "text-muted"}`}
        >
          {n === null
            ? "Type the value."
            : out
              ? `Out of range: ${out === "low" ? "below" : "above"} ${describeRange(step)}.`
              : "Within range."}
        </p>
        {out && step.ifOutOfRange && (
          <Notice tone="warn" title="What to do">
            {step.ifOutOfRange}
          </Notice>
        )}
        {/* Derived figure from the maths engineer's component (e.g. a ⁴He pot pressure → its temperature). */}
        {cryostat && (
          <DerivedValue
            id={`${id}-derived`}
            cryostat={cryostat}
            quantity={step.quantity}
            unit={step.unit}
            value={value}
          />
        )}
        <label className="flex flex-col gap-1 font-semibold">
          Comment{out ? " (required: what was done)" : " (optional)"}
          <textarea
            value={comment}
            onChange={(e) => setComment(e.target.value)}
            rows={2}
            className="rounded-xl border-2 border-line bg-bg px-3 py-2 text-lg"
          />
        </label>
        {correcting && (
          <label className="flex flex-col gap-1 font-semibold">
            Reason for the correction (required)
            <input
              value={reason}
              onChange={(e) => setReason(e.target.value)}
              className="min-h-12 rounded-xl border-2 border-line bg-bg px-3 text-lg"
            />
          </label>
        )}
        <Button
          variant="primary"
          className="min-h-16 text-xl"
          disabled={busy || n === null || needsComment || (Boolean(correcting) && !reason.trim())}
          onClick={async () => {
            if (n === null) return;
            if (othersReading) {
              setSigning(true);
              return;
            }
            setBusy(true);
            try {
              await writeStep(
                ctx,
                payloadOf(n),
                correcting ? { supersedes: correcting.id, reason: reason.trim() } : {},
              );
              done();
            } catch (e) {
              ctx.onError(errorText(e));
            } finally {
              setBusy(false);
            }
          }}
        >
          {othersReading
            ? "Sign and record the correction"
            : correcting
              ? "Record the correction"
              : out
                ? "Record flagged reading"
                : "Record reading"}
        </Button>
        {signing && correcting && n !== null && (
          <SignDialog
            me={ctx.me}
            meaning="verified"
            title="Sign the correction"
            onClose={() => setSigning(false)}
            onSign={async (c) => {
              await recordAndSign(
                [stepDraft(ctx, payloadOf(n), { supersedes: correcting.id, reason: reason.trim() })],
                ctx.me,
                "verified",
                c,
              );
              setSigning(false);
              done();
            }}
          >
            <p>
              I correct a reading someone else recorded, to {n} {step.unit}, because: {reason.trim()}
            </p>
          </SignDialog>
        )}
      </div>
      <Keypad value={value} onChange={setValue} label={`Keypad for ${step.quantity}`} />
    </div>
  );
}

export function CorrectReading({ entry, ctx }: { entry: StoredLocalEntry<"run.step">; ctx: Ctx }) {
  const [open, setOpen] = useState(false);
  const step = ctx.view.template.steps.find((x) => x.id === entry.payload.stepId);
  if (step?.kind !== "reading") return null;
  return (
    <>
      <Button onClick={() => setOpen((o) => !o)} className="ml-auto">
        {open ? "Cancel correction" : "Correct"}
      </Button>
      {open && (
        <div className="mt-3 w-full">
          <ReadingAction step={step} ctx={ctx} correcting={entry} onDone={() => setOpen(false)} />
        </div>
      )}
    </>
  );
}
