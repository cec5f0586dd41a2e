"use client";
// The run's title, cryostat, version and status, the choice of view (one step, all steps, the
// record) and the progress bar.
import { Panel, Tag } from "@/components/ui/panel";
import { useCryostat } from "@/lib/local/hooks";
import type { RunState } from "@/lib/procedures/state";

export function RunHeader({
  state,
  title,
  version,
  cryostatId,
  mode,
  setMode,
}: {
  state: RunState;
  title: string;
  version: number;
  cryostatId: string;
  mode: string;
  setMode: (m: "step" | "list" | "record") => void;
}) {
  const cryostat = useCryostat(cryostatId);
  const { done, required, percent } = state.progress;
  return (
    <Panel className="no-print flex flex-col gap-3">
      <div className="flex flex-wrap items-start justify-between gap-2">
        <div>
          <h1 className="text-2xl font-bold sm:text-3xl">{title}</h1>
          <p className="text-muted">
            {cryostat?.name ?? cryostatId} · procedure version {version} ·{" "}
            {state.status === "open" ? (
              <Tag tone="accent">In progress</Tag>
            ) : state.status === "completed" ? (
              <Tag tone="ok">Completed</Tag>
            ) : (
              <Tag tone="danger">Aborted</Tag>
            )}
          </p>
        </div>
        <div role="tablist" aria-label="How to show the run" className="no-print flex flex-wrap gap-1">
          {(
            [
              ["step", "One step"],
              ["list", "All steps"],
              ["record", "Record"],
            ] as const
          ).map(([m, label]) => (
            // biome-ignore lint/a11y/useButtonType: outside any form, so it submits nothing; kept as the browser tests know it
            <button
              key={m}
              role="tab"
              aria-selected={mode === m}
              onClick={() => setMode(m)}
              className={`min-h-12 rounded-xl border-2 px-4 font-semibold ${mode === m ? "border-accent bg-sunk" : "border-line"}`}
            >
              {label}
            </button>
          ))}
        </div>
      </div>
      <div>
        <div className="flex justify-between text-sm font-semibold">
          <span>
            Progress: <span className="num">{done}</span> of <span className="num">{required}</span> required steps
          </span>
          <span className="num">{percent} %</span>
        </div>
        <div
          role="progressbar"
          aria-label="Run progress"
          aria-valuemin={0}
          aria-valuemax={100}
          aria-valuenow={percent}
          className="mt-1 h-4 overflow-hidden rounded-full bg-sunk"
        >
          <div className="h-full rounded-full bg-accent" style={{ width: `${percent}%` }} />
        </div>
      </div>
    </Panel>
  );
}
