"use client";
// The room at a glance: one card per cryostat with its state and latest figures, read from the
// tablet store (pulled entries + this tablet's unsent ones), so it works with no network.
import Link from "next/link";
import { Loading, Notice, Panel, Tag } from "@/components/ui/panel";
import { formatTemperature, formatWhen, kindLabel, stateLabel, trim } from "@/lib/format";
import {
  type LocalCryostat,
  useCryostats,
  useEntries,
  useFacilityRules,
  useSyncSummary,
  useUserNames,
} from "@/lib/local/hooks";
import { overviewOf } from "@/lib/local/overview";
import { magnetLimitsExceeded } from "@/lib/record/magnet";

const STATE_TONE = { cold: "ok", cooling: "accent", warming: "warn", warm: "neutral", maintenance: "neutral" } as const;

export function RoomOverview() {
  const cryostats = useCryostats();
  const entries = useEntries();
  const names = useUserNames();
  const summary = useSyncSummary();

  if (cryostats === undefined || entries === undefined) return <Loading label="Loading the room…" />;
  if (cryostats.length === 0) {
    return summary?.lastSuccess ? (
      <Notice title="No cryostats yet">The facility admin has not added any cryostats.</Notice>
    ) : (
      <Notice tone="warn" title="This tablet has not been filled yet" role="status">
        The room&apos;s data comes with the first sync. Connect to the network; it arrives within a few seconds.
      </Notice>
    );
  }
  return (
    <ul className="grid gap-4 md:grid-cols-2 xl:grid-cols-3">
      {cryostats.map((c) => (
        <li key={c.id}>
          <CryostatCard c={c} list={entries.filter((e) => e.cryostatId === c.id)} names={names} />
        </li>
      ))}
    </ul>
  );
}

function CryostatCard({
  c,
  list,
  names,
}: {
  c: LocalCryostat;
  list: Parameters<typeof overviewOf>[0];
  names: Record<string, string>;
}) {
  const o = overviewOf(
    list,
    c.config.stages.map((s) => s.key),
  );
  const labelOf = new Map(c.config.stages.map((s) => [s.key, s.label]));
  const rules = useFacilityRules();
  // The facility's rule is the source for the minimum level; the cryostat's own setting only
  // stands in where the rules name none.
  const minimum = rules?.values.minHeliumPercent[c.id] ?? c.config.reservoir?.minimumPercent;
  const fieldBeyond =
    o.field && c.config.magnet
      ? magnetLimitsExceeded(o.field, c.config.magnet, rules?.values.maxRampTPerMin[c.id])
      : [];
  return (
    <Panel className="flex h-full flex-col gap-3">
      <div className="flex items-start justify-between gap-2">
        <div>
          <h2 className="text-2xl font-bold">{c.name}</h2>
          <p className="text-sm text-muted">
            {c.location} · {c.config.description?.split(",")[0]}
          </p>
        </div>
        <Tag tone={o.state ? STATE_TONE[o.state] : "neutral"}>{stateLabel(o.state)}</Tag>
      </div>
      {o.stages.length > 0 && (
        <table className="w-full text-left">
          <caption className="sr-only">Latest stage temperatures</caption>
          <tbody>
            {o.stages.map((s) => (
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
          <Fact
            label="Helium level"
            figure
            warn={o.helium !== null && minimum !== undefined && o.helium.percent < minimum}
          >
            {o.helium ? `${trim(o.helium.percent)} %` : "—"}
            {minimum !== undefined && (
              <span className="block font-sans text-base font-normal text-muted">minimum {minimum} %</span>
            )}
          </Fact>
        )}
        {c.config.magnet && (
          <Fact label="Field" figure warn={fieldBeyond.length > 0}>
            {o.field ? `${trim(o.field.fieldT)} T` : "—"}
            {fieldBeyond.length > 0 && (
              <span className="block font-sans text-base font-semibold text-danger">
                Beyond the magnet's limits: {fieldBeyond.join("; ")}
              </span>
            )}
            {o.field && (
              <span className="block font-sans text-base font-normal text-muted">
                {o.field.persistent ? "persistent mode" : "driven by supply"}
              </span>
            )}
          </Fact>
        )}
        <Fact label="On shift">{o.onShift ? (names[o.onShift.userId] ?? o.onShift.userId) : "—"}</Fact>
        <Fact label="Last entry">
          {o.lastEntry ? kindLabel(o.lastEntry.kind) : "—"}
          {o.lastEntry && (
            <span className="block text-base font-normal text-muted">
              {formatWhen(o.lastEntry.at)}, {names[o.lastEntry.authorId] ?? o.lastEntry.authorId}
            </span>
          )}
        </Fact>
      </dl>
      {o.pending > 0 && (
        <p className="text-sm font-semibold text-accent">
          {o.pending} {o.pending === 1 ? "entry" : "entries"} on this tablet not sent yet
        </p>
      )}
      <Link
        href={`/cryostats/${c.id}`}
        className="mt-auto flex min-h-12 items-center justify-center rounded-xl border-2 border-accent font-semibold text-accent hover:bg-sunk"
      >
        Open {c.name}
      </Link>
    </Panel>
  );
}

/** One fact of a card; `figure` sets the value in the number font (names and words stay in the text font). */
function Fact({
  label,
  children,
  warn = false,
  figure = false,
}: {
  label: string;
  children: React.ReactNode;
  warn?: boolean;
  figure?: boolean;
}) {
  return (
    <div className={`rounded-xl bg-sunk px-3 py-2 ${warn ? "outline-2 outline-danger" : ""}`}>
      <dt className="text-base text-muted">{label}</dt>
      <dd className={`text-lg font-semibold ${figure ? "num" : ""} ${warn ? "text-danger" : ""}`}>{children}</dd>
    </div>
  );
}
