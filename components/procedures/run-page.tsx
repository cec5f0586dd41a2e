"use client";
// Reads ?id= (and ?view=) on the client, so one cached page serves every run offline.
import Link from "next/link";
import { buttonClass } from "@/components/ui/button";
import { Loading, Notice } from "@/components/ui/panel";
import { useQueryParams } from "@/components/ui/use-query-params";
import { RunScreen } from "./run-screen";

export function RunPage() {
  const params = useQueryParams();
  if (!params) return <Loading label="Opening the run…" />;
  const id = params.get("id");
  const view = params.get("view");
  if (!id || !/^[0-9a-f-]{36}$/i.test(id))
    return (
      <Notice tone="neutral" title="No run chosen">
        <Link href="/procedures" className={buttonClass("secondary", "mt-2")}>
          Open the procedures list
        </Link>
      </Notice>
    );
  return (
    <RunScreen key={id} runId={id} initialView={view === "record" ? "record" : view === "list" ? "list" : "step"} />
  );
}
