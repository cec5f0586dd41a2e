"use client";
// A box for the cryostat page: the procedures running on this cryostat, and links to start one
// and to the shift handover. Reads the tablet store only, so it works offline.
import Link from "next/link";
import { buttonClass } from "@/components/ui/button";
import { Panel } from "@/components/ui/panel";
import { formatDate } from "@/lib/format";
import { useEntries } from "@/lib/local/hooks";
import { isKind } from "@/lib/schemas/entry";

export function CryostatProcedures({ cryostatId }: { cryostatId: string }) {
  const list = useEntries({ cryostatId, kinds: ["run.start", "run.abort", "run.complete"] });
  const ended = new Set(
    (list ?? []).filter((e) => e.kind !== "run.start" && e.sync !== "rejected").map((e) => e.runId),
  );
  const open = (list ?? [])
    .filter((e) => isKind(e, "run.start"))
    .filter((e) => e.sync !== "rejected" && !ended.has(e.id));
  return (
    <Panel aria-labelledby={`procs-${cryostatId}`} className="flex flex-col gap-2">
      <h2 id={`procs-${cryostatId}`} className="text-xl font-bold">
        Procedures
      </h2>
      {open.length === 0 ? (
        <p className="text-muted">None running.</p>
      ) : (
        <ul className="flex flex-col gap-1">
          {open.map((e) => (
            <li key={e.id}>
              <Link
                href={`/runs?id=${e.id}`}
                className="flex min-h-12 items-center rounded-xl border-2 border-accent px-4 font-semibold hover:bg-sunk"
              >
                {e.payload.title}{" "}
                <span className="ml-2 text-sm font-normal text-muted">since {formatDate(e.recordedAt)}</span>
              </Link>
            </li>
          ))}
        </ul>
      )}
      <div className="flex flex-wrap gap-2">
        <Link href="/procedures" className={buttonClass("secondary")}>
          Start a procedure
        </Link>
        <Link href={`/handover?cryostat=${encodeURIComponent(cryostatId)}`} className={buttonClass("secondary")}>
          Shift handover
        </Link>
      </div>
    </Panel>
  );
}
