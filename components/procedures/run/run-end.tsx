"use client";
// The end of a run: complete and sign (once every required step is done and every hold point is
// signed), abort with a reason, and signing a completion whose signature did not go through.
// A procedure that makes a transfer record (the helium transfer) writes that record with the
// completion, in one write, and signs both (lib/procedures/transfer-record.ts builds it).
import { useState } from "react";
import { SignDialog } from "@/components/signature/sign-dialog";
import { recordAndSign, writeSignature } from "@/components/signature/write-signature";
import { Button } from "@/components/ui/button";
import { Panel } from "@/components/ui/panel";
import { mayWrite } from "@/lib/auth/permissions";
import { trim } from "@/lib/format";
import { useCryostat } from "@/lib/local/hooks";
import { recordEntry, type StoredLocalEntry } from "@/lib/local/record";
import type { RunState } from "@/lib/procedures/state";
import { makesTransferRecord, transferFromRun } from "@/lib/procedures/transfer-record";
import { completionRefusal } from "@/lib/record/rules";
import { type Ctx, errorText } from "./context";

export function RunEnd({ ctx, state }: { ctx: Ctx; state: RunState<StoredLocalEntry> }) {
  const [signing, setSigning] = useState(false);
  const [aborting, setAborting] = useState(false);
  const [reason, setReason] = useState("");
  const mayComplete = ctx.me.role === "technician" || ctx.me.role === "researcher";
  const cryostat = useCryostat(ctx.cryostatId);
  const record = makesTransferRecord(state.steps.map((s) => s.step))
    ? transferFromRun(state, { calibration: cryostat?.config.reservoir?.calibration })
    : null;
  const canComplete = state.canComplete && (record === null || record.ok);
  return (
    <Panel className="no-print flex flex-col gap-3">
      <div className="flex flex-wrap gap-2">
        <Button
          variant="primary"
          className="min-h-16 flex-1 text-xl"
          disabled={!canComplete || !mayComplete}
          onClick={() => setSigning(true)}
        >
          ✍ Complete and sign
        </Button>
        {mayWrite(ctx.me.role, "run.abort") && (
          <Button variant="danger" className="min-h-16 text-xl" onClick={() => setAborting((a) => !a)}>
            Abort run…
          </Button>
        )}
      </div>
      {!state.canComplete && (
        <p className="text-muted">{completionRefusal(state, { completionSigned: true })?.message}</p>
      )}
      {state.canComplete && record && !record.ok && (
        <p className="font-semibold text-warn">The transfer record cannot be made yet: {record.problems.join(" ")}</p>
      )}
      {record?.ok && (
        <p className="text-muted">
          Completing also records the transfer for the audit:{" "}
          <span className="num">{trim(record.payload.gainedLitres)} L</span> gained,{" "}
          <span className="num">{trim(record.payload.suppliedLitres)} L</span> taken from {record.payload.supplyDewar}
          {record.payload.oxygenLowestPercent !== undefined && (
            <>
              , lowest oxygen <span className="num">{trim(record.payload.oxygenLowestPercent)} %</span>
            </>
          )}
          .
        </p>
      )}
      {aborting && (
        <div className="flex flex-col gap-2">
          <label htmlFor="abort-reason" className="font-semibold">
            Why is the run aborted? (required)
          </label>
          <textarea
            id="abort-reason"
            value={reason}
            onChange={(e) => setReason(e.target.value)}
            rows={2}
            className="rounded-xl border-2 border-line bg-bg px-3 py-2 text-lg"
          />
          <Button
            variant="danger"
            className="self-start"
            disabled={!reason.trim()}
            onClick={async () => {
              try {
                await recordEntry({
                  cryostatId: ctx.cryostatId,
                  runId: state.runId,
                  kind: "run.abort",
                  payload: { reason: reason.trim() },
                });
                setAborting(false);
              } catch (e) {
                ctx.onError(errorText(e));
              }
            }}
          >
            Abort the run
          </Button>
        </div>
      )}
      {signing && (
        <SignDialog
          me={ctx.me}
          meaning="performed"
          title="Complete the procedure"
          onClose={() => setSigning(false)}
          onSign={async (c) => {
            // One write with their signatures: the server refuses a completion sent without its
            // signature, and checks it against the transfer record sent before it.
            const complete = {
              cryostatId: ctx.cryostatId,
              runId: state.runId,
              kind: "run.complete",
              payload: {},
            } as const;
            if (record?.ok) {
              await recordAndSign(
                [
                  { cryostatId: ctx.cryostatId, runId: state.runId, kind: "transfer", payload: record.payload },
                  complete,
                ],
                ctx.me,
                "performed",
                c,
              );
              return;
            }
            await recordAndSign([complete], ctx.me, "performed", c);
          }}
        >
          <p>
            I performed this procedure as recorded: {state.progress.done} of {state.progress.required} required steps
            done.
          </p>
          {record?.ok && <p>My signature also covers the transfer record made from these steps.</p>}
        </SignDialog>
      )}
    </Panel>
  );
}

/** A completion whose signature did not go through (e.g. a wrong password) is signed as it stands. */
export function SignCompletion({ ctx, entry }: { ctx: Ctx; entry: StoredLocalEntry }) {
  const [signing, setSigning] = useState(false);
  if (ctx.me.id !== entry.authorId) return null;
  return (
    <Panel className="no-print">
      <Button variant="primary" className="min-h-16 text-xl" onClick={() => setSigning(true)}>
        ✍ Sign the completion
      </Button>
      {signing && (
        <SignDialog
          me={ctx.me}
          meaning="performed"
          title="Sign the completion"
          onClose={() => setSigning(false)}
          onSign={async (c) => void (await writeSignature(entry, ctx.me, "performed", c))}
        >
          <p>I performed this procedure as recorded.</p>
        </SignDialog>
      )}
    </Panel>
  );
}
