"use client";
// What can be done on a step now, one component per step kind.
import { CautionAction } from "./caution-action";
import { CheckAction } from "./check-action";
import type { Ctx, LocalStep } from "./context";
import { HoldAction } from "./hold-action";
import { NoteAction } from "./note-action";
import { PhotoAction } from "./photo-action";
import { ReadingAction } from "./reading-action";

export function StepAction({ s, ctx }: { s: LocalStep; ctx: Ctx }) {
  const step = s.step;
  switch (step.kind) {
    case "check":
      return <CheckAction step={step} s={s} ctx={ctx} />;
    case "reading":
      return <ReadingAction step={step} ctx={ctx} />;
    case "note":
      return <NoteAction step={step} ctx={ctx} />;
    case "photo":
      return <PhotoAction step={step} ctx={ctx} />;
    case "caution":
      return s.current.length ? null : <CautionAction step={step} ctx={ctx} />;
    case "hold":
      return s.status === "done" ? null : <HoldAction step={step} s={s} ctx={ctx} />;
  }
}
