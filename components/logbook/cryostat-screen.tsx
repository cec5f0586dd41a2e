"use client";
// The cryostat page: its name and state, quick entries, and its logbook, all from the tablet
// store. The id is read from the address, not from the page HTML, so the service worker can
// serve one cached copy of this page for every cryostat when there is no network.
import Link from "next/link";
import { useEffect, useState } from "react";
import { QuickEntry } from "@/components/entries/quick-entry";
import { CryostatProcedures } from "@/components/procedures/cryostat-procedures";
import { useMe } from "@/components/shell/use-me";
import { Loading, Notice } from "@/components/ui/panel";
import { useCryostat } from "@/lib/local/hooks";
import { CryostatLogbook } from "./cryostat-logbook";

function idFromPath(): string | null {
  const m = /^\/cryostats\/([^/]+)/.exec(window.location.pathname);
  return m?.[1] ? decodeURIComponent(m[1]) : null;
}

export function CryostatScreen() {
  const [id, setId] = useState<string | null | undefined>(undefined);
  useEffect(() => setId(idFromPath()), []);
  if (id === undefined) return <Loading label="Loading…" />;
  if (!id) return <Notice tone="danger" title="No cryostat in the address" />;
  return <CryostatView id={id} />;
}

function CryostatView({ id }: { id: string }) {
  const cryostat = useCryostat(id);
  const { me } = useMe();
  return (
    <div className="flex flex-col gap-4">
      <div className="flex flex-wrap items-center justify-between gap-2">
        <div>
          <h1 className="text-3xl font-bold">{cryostat?.name ?? id}</h1>
          {cryostat && (
            <p className="text-muted">
              {cryostat.location} · {cryostat.config.description}
            </p>
          )}
        </div>
        <Link href="/" className="flex min-h-12 items-center rounded-xl px-4 font-semibold text-accent hover:bg-sunk">
          ← Room
        </Link>
      </div>
      {cryostat === undefined ? (
        <Loading label="Loading the cryostat…" />
      ) : cryostat === null ? (
        <Notice tone="warn" title="This cryostat is not on the tablet">
          Either it does not exist or the tablet has not synced since it was added. Connect to the network and open it
          again.
        </Notice>
      ) : (
        <>
          <QuickEntry cryostat={cryostat} role={me?.role ?? null} />
          <CryostatProcedures cryostatId={id} />
        </>
      )}
      <CryostatLogbook cryostatId={id} />
    </div>
  );
}
