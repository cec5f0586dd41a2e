"use client";
// The safety officer's desk: the queue of records not yet audited (with flags), the table of all
// transfers with filters, sorting and exports, and the chain check of each cryostat.
import Link from "next/link";
import { useCallback, useEffect, useState } from "react";
import { Button, buttonClass } from "@/components/ui/button";
import { type Choice, OptionList, TableHead } from "@/components/ui/form";
import { Loading, Notice, Panel, Tag } from "@/components/ui/panel";
import { api, getJson, problemText, useJson } from "@/components/ui/use-json";
import type { ChainReport } from "@/lib/audit/chain";
import { FLAG_CODES, FLAG_LABEL } from "@/lib/audit/flags";
import type { AuditItem } from "@/lib/audit/types";
import { formatDate, kindLabel, trim } from "@/lib/format";
import { useCryostats } from "@/lib/local/hooks";
import { payloadOf } from "@/lib/schemas/entry";
import { FlagTags } from "./flag-tags";

const TABS = [
  { key: "queue", label: "Queue" },
  { key: "table", label: "All transfers" },
  { key: "chain", label: "Chain check" },
] as const;

export function AuditHome() {
  const [tab, setTab] = useState<(typeof TABS)[number]["key"]>("queue");
  return (
    <>
      <div role="tablist" aria-label="Audit" className="mb-4 flex flex-wrap gap-2">
        {TABS.map((t) => (
          <button
            type="button"
            key={t.key}
            role="tab"
            aria-selected={tab === t.key}
            onClick={() => setTab(t.key)}
            className={`min-h-12 rounded-xl border-2 px-5 font-semibold ${tab === t.key ? "border-accent bg-sunk" : "border-line"}`}
          >
            {t.label}
          </button>
        ))}
      </div>
      {tab === "queue" && <Queue />}
      {tab === "table" && <TransferTable />}
      {tab === "chain" && <ChainCheck />}
    </>
  );
}

function Summary({ i }: { i: AuditItem }) {
  if (i.entry.kind === "transfer") {
    const p = i.entry.payload;
    const eff = i.figures && "efficiencyPercent" in i.figures ? i.figures.efficiencyPercent : null;
    return (
      <span>
        <span className="num">{trim(Number(p.gainedLitres))}</span> L of{" "}
        <span className="num">{trim(Number(p.suppliedLitres))}</span> L
        {eff !== null && (
          <>
            {" ("}
            <span className="num">{trim(eff)}</span> %)
          </>
        )}{" "}
        · {i.peopleNames.join(", ")}
      </span>
    );
  }
  if (i.entry.kind === "quench")
    return (
      <span>
        at <span className="num">{trim(Number(i.entry.payload.fieldT))}</span> T
      </span>
    );
  return <span>{payloadOf(i.entry, "incident")?.title ?? ""}</span>;
}

function Queue() {
  const { data, error } = useJson<{ items: AuditItem[] }>("/api/audit/queue");
  const items = data?.items;
  if (error) return <Notice tone="danger" role="alert" title={error.message} />;
  if (!items) return <Loading />;
  if (!items.length)
    return <Notice tone="ok" title="Nothing waiting: every transfer, quench and incident has a signed audit." />;
  return (
    <Panel className="p-0">
      <table className="w-full text-left">
        <caption className="px-5 py-3 text-left text-lg font-bold">Waiting for audit ({items.length})</caption>
        <TableHead columns={["When", "What", "Flags", { srOnly: "Open" }]} />
        <tbody>
          {items.map((i) => (
            <tr key={i.entry.id} className="border-t border-line align-top" data-record={i.entry.id}>
              <td className="px-5 py-3 whitespace-nowrap">{formatDate(i.entry.recordedAt)}</td>
              <td className="px-5 py-3">
                <span className="font-semibold">
                  {kindLabel(i.entry.kind)}
                  {i.corrects ? " (correction)" : ""} · {i.cryostatName}
                </span>
                <span className="block text-base text-muted">
                  by {i.authorName} · <Summary i={i} />
                </span>
                {i.findings.length > 0 && <Tag tone="accent">finding not signed</Tag>}
              </td>
              <td className="px-5 py-3">
                <FlagTags flags={i.flags} />
              </td>
              <td className="px-5 py-3">
                <Link
                  className={buttonClass("secondary")}
                  href={`/audit/${i.entry.id}`}
                  aria-label={`Open ${kindLabel(i.entry.kind)} on ${i.cryostatName} of ${formatDate(i.entry.recordedAt)}`}
                >
                  Open
                </Link>
              </td>
            </tr>
          ))}
        </tbody>
      </table>
    </Panel>
  );
}

const SORTS: Choice[] = [
  { value: "date", label: "Date" },
  { value: "cryostat", label: "Cryostat" },
  { value: "efficiency", label: "Efficiency" },
  { value: "flags", label: "Number of flags" },
];

type Filters = { cryostat: string; person: string; from: string; to: string; flag: string; sort: string; dir: string };

function TransferTable() {
  const [f, setF] = useState<Filters>({
    cryostat: "",
    person: "",
    from: "",
    to: "",
    flag: "",
    sort: "date",
    dir: "desc",
  });
  const cryostats = useCryostats() ?? [];
  const [options, setOptions] = useState<{ people: { id: string; name: string }[] }>({ people: [] });
  const query = new URLSearchParams(Object.entries(f).filter(([, v]) => v)).toString();
  const { data, error } = useJson<{ items: AuditItem[] }>(`/api/audit/transfers?${query}`);
  const items = data?.items ?? null;
  useEffect(() => {
    if (!items) return;
    const people = new Map<string, string>();
    for (const i of items) {
      people.set(i.entry.authorId, i.authorName);
      for (const [k, id] of (payloadOf(i.entry, "transfer")?.peoplePresent ?? []).entries())
        people.set(id, i.peopleNames[k] ?? id);
    }
    setOptions((o) => ({
      ...o,
      people: [
        ...new Set([
          ...o.people.map((p) => JSON.stringify(p)),
          ...[...people].map(([id, name]) => JSON.stringify({ id, name })),
        ]),
      ].map((s) => JSON.parse(s)),
    }));
  }, [items]);
  const sel = "min-h-12 rounded-xl border-2 border-line bg-bg px-3";
  const set = (k: keyof Filters) => (e: { target: { value: string } }) => setF((x) => ({ ...x, [k]: e.target.value }));
  const pick = (k: keyof Filters, label: string, choices: Choice[]) => (
    <label className="flex flex-col gap-1 font-semibold">
      {label}
      <select className={sel} value={f[k]} onChange={set(k)}>
        <OptionList options={choices} />
      </select>
    </label>
  );
  const day = (k: keyof Filters, label: string) => (
    <label className="flex flex-col gap-1 font-semibold">
      {label}
      <input type="date" className={sel} value={f[k]} onChange={set(k)} />
    </label>
  );
  return (
    <div className="flex flex-col gap-4">
      <Panel>
        <form className="flex flex-wrap items-end gap-3" onSubmit={(e) => e.preventDefault()} aria-label="Filters">
          {pick("cryostat", "Cryostat", [
            { value: "", label: "All" },
            ...cryostats.map((c) => ({ value: c.id, label: c.name })),
          ])}
          {pick("person", "Person", [
            { value: "", label: "Anyone" },
            ...options.people.map((p) => ({ value: p.id, label: p.name })),
          ])}
          {day("from", "From")}
          {day("to", "To")}
          {pick("flag", "Flag", [
            { value: "", label: "Any" },
            ...FLAG_CODES.map((c) => ({ value: c, label: FLAG_LABEL[c] })),
          ])}
          {pick("sort", "Sort by", SORTS)}
          <Button
            onClick={() => setF((x) => ({ ...x, dir: x.dir === "asc" ? "desc" : "asc" }))}
            aria-label={`Order: ${f.dir === "asc" ? "ascending" : "descending"}`}
          >
            {f.dir === "asc" ? "↑ Ascending" : "↓ Descending"}
          </Button>
          <a className={buttonClass("secondary")} href={`/api/exports/transfers?${query}`} download>
            Export CSV
          </a>
          <a
            className={buttonClass("secondary")}
            href={`/api/exports/report?${new URLSearchParams(Object.entries({ from: f.from, to: f.to, cryostat: f.cryostat }).filter(([, v]) => v)).toString()}`}
            download
          >
            PDF audit report
          </a>
        </form>
        <p className="mt-2 text-sm text-muted">
          The PDF report covers the chosen period (default: the last 30 days) with every transfer, quench and incident,
          its flags and its signatures.
        </p>
      </Panel>
      {error && <Notice tone="danger" role="alert" title={error.message} />}
      {!items && !error && <Loading />}
      {items && (
        <Panel className="overflow-x-auto p-0">
          <table className="w-full text-left">
            <caption className="px-5 py-3 text-left text-lg font-bold">Transfers ({items.length})</caption>
            <TableHead
              cell="px-4 py-2"
              columns={["When", "Cryostat", "People", "Litres", "Efficiency", "Flags", "Audit"]}
            />
            <tbody>
              {items.map((i) => {
                const p = payloadOf(i.entry, "transfer");
                const eff = i.figures && "efficiencyPercent" in i.figures ? i.figures.efficiencyPercent : null;
                return (
                  <tr key={i.entry.id} className="border-t border-line align-top">
                    <td className="px-4 py-2 whitespace-nowrap">
                      <Link
                        className="inline-flex min-h-12 items-center font-semibold text-accent underline"
                        href={`/audit/${i.entry.id}`}
                      >
                        {formatDate(i.entry.recordedAt)}
                      </Link>
                    </td>
                    <td className="px-4 py-2">{i.cryostatName}</td>
                    <td className="px-4 py-2">{i.peopleNames.join(", ")}</td>
                    <td className="num px-4 py-2">
                      {trim(p?.gainedLitres ?? NaN)} / {trim(p?.suppliedLitres ?? NaN)} L
                    </td>
                    <td className="num px-4 py-2">{eff === null ? "—" : `${trim(eff)} %`}</td>
                    <td className="px-4 py-2">
                      <FlagTags flags={i.flags} />
                    </td>
                    <td className="px-4 py-2">
                      {i.verdict ? (
                        <Tag tone={i.verdict === "acceptable" ? "ok" : "danger"}>
                          {i.verdict === "acceptable" ? "Acceptable" : "Needs action"}
                        </Tag>
                      ) : (
                        <Tag>Not audited</Tag>
                      )}
                    </td>
                  </tr>
                );
              })}
            </tbody>
          </table>
        </Panel>
      )}
    </div>
  );
}

function ChainCheck() {
  const [reports, setReports] = useState<ChainReport[] | null>(null);
  const [error, setError] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);
  const check = useCallback(() => {
    setBusy(true);
    setError(null);
    getJson<{ reports: ChainReport[] }>("/api/chain")
      .then(
        (b) => setReports(b.reports),
        (e: unknown) => setError(problemText(e)),
      )
      .finally(() => setBusy(false));
  }, []);
  useEffect(check, [check]);
  async function signNow() {
    setBusy(true);
    try {
      await api("/api/chain", { method: "POST", json: {} });
      check();
    } catch (e) {
      setError(problemText(e, "No connection to the server: the chain heads were not signed."));
      setBusy(false);
    }
  }
  return (
    <Panel>
      <p className="mb-3">
        Every cryostat's log is a hash chain. The check recomputes each link and compares it with the server's signed
        checkpoints (Ed25519, key kept outside the database), so a row changed, inserted, deleted or reordered in the
        database — or a chain recomputed after a change — is named here.
      </p>
      <div className="mb-3 flex gap-2">
        <Button variant="primary" onClick={check} disabled={busy}>
          {busy ? "Checking…" : "Check all chains now"}
        </Button>
        <Button onClick={() => void signNow()} disabled={busy}>
          Sign the chain heads now
        </Button>
      </div>
      {error && <Notice tone="danger" role="alert" title={error} />}
      {reports && (
        <ul className="flex flex-col gap-2">
          {reports.map((r) => (
            <li key={r.chain} data-chain={r.chain} data-ok={r.ok}>
              <Notice tone={r.ok ? "ok" : "danger"} title={`${r.chain}: ${r.ok ? "verified" : `broken — ${r.kind}`}`}>
                {r.ok ? (
                  <p>
                    {r.count} entries; {r.checkpointsChecked} signed checkpoint(s) match.
                  </p>
                ) : (
                  <p>
                    {r.message}
                    {r.firstBad && (
                      <span className="block">
                        First bad entry: seq {r.firstBad.seq}, {kindLabel(r.firstBad.kind)} of{" "}
                        {formatDate(r.firstBad.recordedAt)} ({r.firstBad.id}).
                      </span>
                    )}
                  </p>
                )}
                {r.untrustedCheckpoints > 0 && (
                  <p className="text-warn">
                    {r.untrustedCheckpoints} checkpoint(s) in the database are not signed by this server's key and were
                    ignored.
                  </p>
                )}
              </Notice>
            </li>
          ))}
        </ul>
      )}
    </Panel>
  );
}
