"use client";
// The room at a glance: one card per cryostat with its state and latest figures.
import Link from "next/link";
import { useEffect, useState } from "react";
import { Loading, Notice, Panel, Tag } from "@/components/ui/panel";
import { Button } from "@/components/ui/button";
import type { CryostatOverview } from "@/db/queries/cryostats";
import { formatTemperature, formatWhen, kindLabel, stateLabel, trim } from "@/lib/format";

type Load = { status: "loading" } | { status: "error"; message: string } | { status: "ok"; cryostats: CryostatOverview[] };

const STATE_TONE = { cold: "ok", cooling: "accent", warming: "warn", warm: "neutral", maintenance: "neutral" } as const;

export function RoomOverview() {
  const [load, setLoad] = useState<Load>({ status: "loading" });
  const [attempt, setAttempt] = useState(0);
  useEffect(() => {
    let live = true;
    fetch("/api/cryostats", { cache: "no-store" })
      .then(async (r) => {
        const body = await r.json();
        if (!r.ok) throw new Error(body?.error?.message ?? `The server answered ${r.status}.`);
        if (live) setLoad({ status: "ok", cryostats: body.cryostats });
      })
      .catch((e: Error) => live && setLoad({ status: "error", message: e.message.includes("fetch") ? "No connection to the server." : e.message }));
    return () => {
      live = false;
    };
  }, [attempt]);

  if (load.status === "loading") return <Loading label="Loading the room…" />;
  if (load.status === "error")
    return (
      <Notice tone="danger" title="Could not load the room" role="alert">
        <p className="mb-2">{load.message}</p>
        <Button onClick={() => setAttempt((n) => n + 1)}>Try again</Button>
      </Notice>
    );
  return (
    <ul className="grid gap-4 md:grid-cols-2 xl:grid-cols-3">
      {load.cryostats.map((c) => (
        <li key={c.id}>
          <CryostatCard c={c} />
        </li>
      ))}
    </ul>
  );
}

function CryostatCard({ c }: { c: CryostatOverview }) {
  const labelOf = new Map(c.config.stages.map((s) => [s.key, s.label]));
  const minimum = c.config.reservoir?.minimumPercent;
  return (
    <Panel className="flex h-full flex-col gap-3">
      <div className="flex items-start justify-between gap-2">
        <div>
          <h2 className="text-2xl font-bold">{c.name}</h2>
          <p className="text-sm text-muted">
            {c.location} · {c.config.description?.split(",")[0]}
          </p>
        </div>
        <Tag tone={c.state ? STATE_TONE[c.state] : "neutral"}>{stateLabel(c.state)}</Tag>
      </div>
      {c.stages.length > 0 && (
        <table className="w-full text-left">
          <caption className="sr-only">Latest stage temperatures</caption>
          <tbody>
            {c.stages.map((s) => (
              <tr key={s.stage} className="border-t border-line">
                <th scope="row" className="py-1 font-normal text-muted">
                  {labelOf.get(s.stage) ?? s.stage}
                </th>
                <td className="num py-1 text-right text-lg font-semibold">{formatTemperature(s.value, s.unit)}</td>
              </tr>
            ))}
          </tbody>
        </table>
      )}
      <dl className="grid grid-cols-2 gap-2">
        {c.config.reservoir && (
          <Fact label="Helium level" warn={c.helium !== null && minimum !== undefined && c.helium.percent < minimum}>
            {c.helium ? `${trim(c.helium.percent)} %` : "—"}
            {minimum !== undefined && <span className="block text-sm font-normal text-muted">minimum {minimum} %</span>}
          </Fact>
        )}
        {c.config.magnet && (
          <Fact label="Field">
            {c.field ? `${trim(c.field.fieldT)} T` : "—"}
            {c.field && <span className="block text-sm font-normal text-muted">{c.field.persistent ? "persistent mode" : "driven by supply"}</span>}
          </Fact>
        )}
        <Fact label="On shift">{c.onShift?.name ?? "—"}</Fact>
        <Fact label="Last entry">
          {c.lastEntry ? kindLabel(c.lastEntry.kind) : "—"}
          {c.lastEntry && (
            <span className="block text-sm font-normal text-muted">
              {formatWhen(c.lastEntry.at)}, {c.lastEntry.authorName}
            </span>
          )}
        </Fact>
      </dl>
      <Link href={`/cryostats/${c.id}`} className="mt-auto flex min-h-12 items-center justify-center rounded-xl border-2 border-accent font-semibold text-accent hover:bg-sunk">
        Open {c.name}
      </Link>
    </Panel>
  );
}

function Fact({ label, children, warn = false }: { label: string; children: React.ReactNode; warn?: boolean }) {
  return (
    <div className={`rounded-xl bg-sunk px-3 py-2 ${warn ? "outline-2 outline-danger" : ""}`}>
      <dt className="text-sm text-muted">{label}</dt>
      <dd className={`num text-lg font-semibold ${warn ? "text-danger" : ""}`}>{children}</dd>
    </div>
  );
}
