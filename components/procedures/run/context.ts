// What every part of the run screen is handed: the run as the tablet sees it, who is signed in,
// the cryostat, where a failed write is reported, and the people's names; and the one way a step
// entry is written.
import { type EntryDraft, LocalWriteError, recordEntry, type StoredLocalEntry } from "@/lib/local/record";
import type { StepState } from "@/lib/procedures/state";
import type { PayloadInput } from "@/lib/schemas/entry";
import type { SessionUser } from "@/lib/schemas/user";
import type { RunView } from "../use-run";

export type Ctx = {
  view: RunView;
  me: SessionUser;
  cryostatId: string;
  onError: (m: string | null) => void;
  names: Record<string, string>;
};

/** A step of the run with its entries as the tablet holds them. */
export type LocalStep = StepState<StoredLocalEntry>;

export function errorText(e: unknown): string {
  if (e instanceof LocalWriteError) return [e.message, ...e.problems].join(" ");
  return (e as Error).message || "Nothing was saved.";
}

/** The draft of a step entry for this run (a correction names what it supersedes and why). */
export function stepDraft(
  ctx: Ctx,
  payload: PayloadInput<"run.step">,
  extra: { supersedes?: string; reason?: string } = {},
): EntryDraft<"run.step"> {
  return { cryostatId: ctx.cryostatId, runId: ctx.view.state.runId, kind: "run.step", payload, ...extra };
}

export async function writeStep(
  ctx: Ctx,
  payload: PayloadInput<"run.step">,
  extra: { supersedes?: string; reason?: string } = {},
) {
  ctx.onError(null);
  return recordEntry(stepDraft(ctx, payload, extra));
}
