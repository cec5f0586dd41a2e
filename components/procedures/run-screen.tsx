"use client";
// Running a procedure on the tablet: one step at a time (or the whole list), progress, readings
// on a big keypad checked against the pinned range as they are typed, notes and photos per step,
// hold points signed by the required role, abort with a reason, completion signed. Everything is
// written to the tablet store first; the run's state is derived from the log (use-run.ts).
// The parts live in ./run/: header, step card (one action component per step kind), run end.
import Link from "next/link";
import { useEffect, useState } from "react";
import { useMe } from "@/components/shell/use-me";
import { Button, buttonClass } from "@/components/ui/button";
import { Loading, Notice } from "@/components/ui/panel";
import { useUserNames } from "@/lib/local/hooks";
import type { Ctx } from "./run/context";
import { RunEnd, SignCompletion } from "./run/run-end";
import { RunHeader } from "./run/run-header";
import { StepCard } from "./run/step-card";
import { RunRecord } from "./run-record";
import { useRun } from "./use-run";

export function RunScreen({
  runId,
  initialView = "step",
}: {
  runId: string;
  initialView?: "step" | "list" | "record";
}) {
  const { me } = useMe();
  const view = useRun(runId);
  const [mode, setMode] = useState<"step" | "list" | "record">(initialView);
  const [index, setIndex] = useState<number | null>(null);
  const [error, setError] = useState<string | null>(null);
  const names = useUserNames();

  // Follow the work: open on the first step still to do, once the run is known.
  const current = view?.state.currentIndex ?? null;
  useEffect(() => {
    if (index === null && view) setIndex(current ?? 0);
  }, [index, view, current]);

  if (view === undefined) return <Loading label="Opening the run on this tablet…" />;
  if (view === null || !me)
    return (
      <Notice tone="warn" title="This run is not on this tablet yet">
        <p>
          It appears here after the tablet has synced once with the network (or open it on the tablet where it was
          started).
        </p>
        <Link href="/procedures" className={buttonClass("secondary", "mt-2")}>
          ← Procedures
        </Link>
      </Notice>
    );

  const { state, template, start } = view;
  const ctx: Ctx = { view, me, cryostatId: start.cryostatId ?? "", onError: setError, names };
  const at = Math.min(index ?? 0, state.steps.length - 1);
  const s = state.steps[at];

  return (
    <div className="flex flex-col gap-4">
      <RunHeader
        state={state}
        title={String(state.startPayload?.title ?? template.title)}
        version={template.version}
        cryostatId={ctx.cryostatId}
        mode={mode}
        setMode={setMode}
      />
      {error && (
        <Notice tone="danger" title="Not saved" role="alert">
          <p>{error}</p>
        </Notice>
      )}
      {view.rejected.length > 0 && (
        <Notice tone="danger" title="Refused by the server" role="alert">
          <ul className="list-disc pl-5">
            {view.rejected.map((e) => (
              <li key={e.id}>
                {e.kind}: {e.rejection?.message}
              </li>
            ))}
          </ul>
        </Notice>
      )}
      {state.flags.length > 0 && mode !== "record" && (
        <Notice tone="warn" title="Flags on this run">
          <ul className="list-disc pl-5">
            {state.flags.map((f) => (
              <li key={f}>{f}</li>
            ))}
          </ul>
        </Notice>
      )}

      {mode === "record" ? (
        <RunRecord view={view} names={names} />
      ) : mode === "list" ? (
        <ol aria-label="Steps" className="flex flex-col gap-3">
          {state.steps.map((st) => (
            <li key={st.step.id}>
              <StepCard
                s={st}
                ctx={ctx}
                total={state.steps.length}
                compact={st.index !== at}
                onOpen={() => setIndex(st.index)}
              />
            </li>
          ))}
        </ol>
      ) : s ? (
        <>
          <StepCard s={s} ctx={ctx} total={state.steps.length} />
          <nav aria-label="Steps" className="no-print flex flex-wrap items-center gap-2">
            <Button
              onClick={() => setIndex(Math.max(0, at - 1))}
              disabled={at === 0}
              className="min-h-14 flex-1 text-lg"
            >
              ← Previous step
            </Button>
            {current !== null && current !== at && (
              <Button onClick={() => setIndex(current)} className="min-h-14 flex-1 text-lg">
                Go to step {current + 1}
              </Button>
            )}
            <Button
              variant="primary"
              onClick={() => setIndex(Math.min(state.steps.length - 1, at + 1))}
              disabled={at >= state.steps.length - 1}
              className="min-h-14 flex-1 text-lg"
            >
              Next step →
            </Button>
          </nav>
        </>
      ) : null}

      {state.status === "open" && mode !== "record" && <RunEnd ctx={ctx} state={state} />}
      {state.completed &&
        !state.signatures.some(
          (g) => g.valid && g.meaning === "performed" && g.signedEntryId === state.completed?.entry.id,
        ) && <SignCompletion ctx={ctx} entry={state.completed.entry} />}
    </div>
  );
}
