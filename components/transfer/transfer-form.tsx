"use client";
// Quick entry of a helium transfer on the tablet (works offline: written to the tablet store, synced
// later). Shows the transfer cautions with the facility's values, and computes efficiency, gas sent
// to recovery and boil-off since the previous transfer as the figures are typed. People present
// are the facility's users or named visitors; the same rule as the server's
// (lib/record/people.ts) runs before saving.
import { useMemo, useState } from "react";
import { Caution } from "@/components/safety/caution";
import { useMe } from "@/components/shell/use-me";
import { SignDialog } from "@/components/signature/sign-dialog";
import { writeSignature } from "@/components/signature/write-signature";
import { Button } from "@/components/ui/button";
import {
  ChoiceButtons,
  FieldRow as Field,
  FieldGroup,
  INPUT_CLASS,
  NumberField,
  OptionList,
  ProblemNotice,
} from "@/components/ui/form";
import { Notice, Panel } from "@/components/ui/panel";
import { transferFigures } from "@/lib/audit/figures";
import { litresFromLevel, litresFromMass } from "@/lib/cryo";
import { trim } from "@/lib/format";
import { useCryostats, useEntries, useFacilityRules, useUsers } from "@/lib/local/hooks";
import { LocalWriteError, recordEntry, type StoredLocalEntry } from "@/lib/local/record";
import { parseListedPerson, peopleProblems, VISITOR_NAME_MAX, visitorEntry } from "@/lib/record/people";
import { type PayloadInput, payloadOf } from "@/lib/schemas/entry";
import { typedNumber } from "@/lib/typed-number";

const SUPPLIED_BY = [
  { value: "level", label: "By level" },
  { value: "weight", label: "By weight" },
] as const;

export function TransferForm({ initialCryostatId }: { initialCryostatId?: string }) {
  const { me } = useMe();
  const cryostats = useCryostats();
  const users = useUsers();
  const rules = useFacilityRules();
  const withReservoir = (cryostats ?? []).filter((c) => c.config.reservoir);
  const [cryostatId, setCryostatId] = useState(initialCryostatId ?? "");
  const cid = cryostatId || withReservoir[0]?.id || "";
  const cryostat = withReservoir.find((c) => c.id === cid);
  const previous = useEntries({ cryostatId: cid || "-", kinds: ["transfer"], limit: 1 });

  const [f, setF] = useState({
    supplyDewar: "",
    people: [] as string[],
    ppeConfirmed: false,
    oxygenMonitorChecked: false,
    oxygenLowest: "",
    levelBefore: "",
    levelAfter: "",
    pressureBefore: "",
    pressureAfter: "",
    suppliedBy: "level" as "level" | "weight",
    supplied: "",
    massBefore: "",
    massAfter: "",
    gained: "",
    duration: "",
    anomalies: "",
  });
  const set = <K extends keyof typeof f>(k: K, v: (typeof f)[K]) => setF((x) => ({ ...x, [k]: v }));
  const people = f.people.length || !me ? f.people : [me.id];
  const [visitorName, setVisitorName] = useState("");
  const visitors = people.flatMap((p) => {
    const v = parseListedPerson(p);
    return v.kind === "visitor" ? [{ entry: p, name: v.name }] : [];
  });
  function addVisitor() {
    if (!visitorName.trim()) return;
    const entry = visitorEntry(visitorName);
    if (!people.includes(entry)) set("people", [...people, entry]);
    setVisitorName("");
  }

  const [saved, setSaved] = useState<StoredLocalEntry | null>(null);
  const [signed, setSigned] = useState(false);
  const [signing, setSigning] = useState(false);
  const [error, setError] = useState<{ title: string; problems: string[] } | null>(null);
  const [busy, setBusy] = useState(false);

  const suppliedLitres = useMemo(() => {
    if (f.suppliedBy === "level") return typedNumber(f.supplied);
    const b = typedNumber(f.massBefore);
    const a = typedNumber(f.massAfter);
    if (b === undefined || a === undefined || b < a) return undefined;
    return Number(litresFromMass(b - a).toFixed(1));
  }, [f.suppliedBy, f.supplied, f.massBefore, f.massAfter]);

  const gainedFromLevels = useMemo(() => {
    const cal = cryostat?.config.reservoir?.calibration;
    const b = typedNumber(f.levelBefore);
    const a = typedNumber(f.levelAfter);
    if (!cal || b === undefined || a === undefined) return undefined;
    try {
      return Number((litresFromLevel(a, cal) - litresFromLevel(b, cal)).toFixed(1));
    } catch {
      return undefined;
    }
  }, [cryostat, f.levelBefore, f.levelAfter]);
  const gainedLitres = typedNumber(f.gained) ?? gainedFromLevels;

  const prev = previous?.[0];
  const prevFill = payloadOf(prev, "transfer");
  const figures = useMemo(() => {
    const b = typedNumber(f.levelBefore);
    const a = typedNumber(f.levelAfter);
    if (b === undefined || a === undefined || suppliedLitres === undefined || gainedLitres === undefined) return null;
    try {
      return transferFigures(
        { levelBeforePercent: b, levelAfterPercent: a, suppliedLitres, gainedLitres },
        {
          calibration: cryostat?.config.reservoir?.calibration,
          previous: prev && prevFill ? { levelAfterPercent: prevFill.levelAfterPercent, at: prev.recordedAt } : null,
          at: new Date().toISOString(),
        },
      );
    } catch {
      return null;
    }
  }, [f.levelBefore, f.levelAfter, suppliedLitres, gainedLitres, cryostat, prev, prevFill]);

  async function save() {
    setError(null);
    const listed = peopleProblems(people, users ?? []);
    if (listed.length) {
      setError({ title: "Check the people present: nothing was saved.", problems: listed });
      return;
    }
    setBusy(true);
    try {
      // Empty or mistyped figures go as NaN: the shared schema refuses them with the field's name.
      const payload: PayloadInput<"transfer"> = {
        supplyDewar: f.supplyDewar,
        peoplePresent: people,
        ppeConfirmed: f.ppeConfirmed,
        oxygenMonitorChecked: f.oxygenMonitorChecked,
        ...(typedNumber(f.oxygenLowest) !== undefined ? { oxygenLowestPercent: typedNumber(f.oxygenLowest) } : {}),
        levelBeforePercent: typedNumber(f.levelBefore) ?? Number.NaN,
        levelAfterPercent: typedNumber(f.levelAfter) ?? Number.NaN,
        ...(typedNumber(f.pressureBefore) !== undefined ? { pressureBeforeMbar: typedNumber(f.pressureBefore) } : {}),
        ...(typedNumber(f.pressureAfter) !== undefined ? { pressureAfterMbar: typedNumber(f.pressureAfter) } : {}),
        suppliedLitres: suppliedLitres ?? Number.NaN,
        suppliedBy: f.suppliedBy,
        ...(f.suppliedBy === "weight"
          ? { supplyMassBeforeKg: typedNumber(f.massBefore), supplyMassAfterKg: typedNumber(f.massAfter) }
          : {}),
        gainedLitres: gainedLitres ?? Number.NaN,
        durationMin: typedNumber(f.duration) ?? Number.NaN,
        anomalies: f.anomalies,
      };
      const e = await recordEntry({ cryostatId: cid, kind: "transfer", payload });
      setSaved(e);
    } catch (e) {
      if (e instanceof LocalWriteError) setError({ title: e.message, problems: e.problems });
      else setError({ title: (e as Error).message, problems: [] });
    } finally {
      setBusy(false);
    }
  }

  async function signPerformed(
    entry: StoredLocalEntry,
    signer: NonNullable<typeof me>,
    c: Parameters<typeof writeSignature>[3],
  ) {
    await writeSignature(entry, signer, "performed", c);
    setSigned(true);
  }

  if (saved) {
    return (
      <Panel>
        <Notice tone="ok" role="status" title="Transfer saved on this tablet">
          It is sent to the server with the next sync and goes to the safety officer's audit queue.
        </Notice>
        <div className="mt-4 flex flex-wrap gap-2">
          {!signed && me && (
            <Button variant="primary" onClick={() => setSigning(true)}>
              Sign as performed
            </Button>
          )}
          {signed && <p className="font-semibold text-ok">Signed as performed.</p>}
          <Button
            onClick={() => {
              setSaved(null);
              setSigned(false);
            }}
          >
            Record another transfer
          </Button>
        </div>
        {signing && me && (
          <SignDialog
            me={me}
            meaning="performed"
            title="Sign the helium transfer"
            onClose={() => setSigning(false)}
            onSign={(c) => signPerformed(saved, me, c)}
          />
        )}
      </Panel>
    );
  }

  const ppe = rules?.values.ppe ?? [];
  const active = (users ?? []).filter(
    (u) => u.active && (u.role === "technician" || u.role === "researcher" || u.role === "safety_officer"),
  );

  return (
    <div className="grid gap-4 lg:grid-cols-[1fr_24rem]">
      <Panel>
        <form
          className="flex flex-col gap-4"
          noValidate
          onSubmit={(e) => {
            e.preventDefault();
            void save();
          }}
        >
          <div className="grid gap-3 sm:grid-cols-2">
            <Field id="t-cryostat" label="Cryostat">
              <select
                id="t-cryostat"
                className={INPUT_CLASS}
                value={cid}
                onChange={(e) => setCryostatId(e.target.value)}
              >
                <OptionList options={withReservoir.map((c) => ({ value: c.id, label: c.name }))} />
              </select>
            </Field>
            <Field id="t-supply" label="Supply dewar">
              <input
                id="t-supply"
                className={INPUT_CLASS}
                value={f.supplyDewar}
                onChange={(e) => set("supplyDewar", e.target.value)}
                placeholder="e.g. D-250-A"
              />
            </Field>
          </div>

          <FieldGroup legend="People present">
            <div className="flex flex-wrap gap-2">
              {active.map((u) => (
                <label key={u.id} className="flex min-h-12 items-center gap-2 rounded-xl border-2 border-line px-3">
                  <input
                    type="checkbox"
                    className="h-6 w-6"
                    checked={people.includes(u.id)}
                    onChange={(e) =>
                      set("people", e.target.checked ? [...people, u.id] : people.filter((p) => p !== u.id))
                    }
                  />
                  {u.name}
                </label>
              ))}
              {visitors.map((v) => (
                <label
                  key={v.entry}
                  className="flex min-h-12 items-center gap-2 rounded-xl border-2 border-warn px-3"
                  title="A visitor is flagged for the safety officer's audit."
                >
                  <input
                    type="checkbox"
                    className="h-6 w-6"
                    checked
                    onChange={() =>
                      set(
                        "people",
                        people.filter((p) => p !== v.entry),
                      )
                    }
                  />
                  {v.name} (visitor)
                </label>
              ))}
            </div>
            <div className="mt-2 flex flex-wrap items-end gap-2">
              <Field id="t-visitor" label="Add a visitor (not a user of the facility)">
                <input
                  id="t-visitor"
                  className={INPUT_CLASS}
                  value={visitorName}
                  maxLength={VISITOR_NAME_MAX}
                  placeholder="Full name"
                  onChange={(e) => setVisitorName(e.target.value)}
                  onKeyDown={(e) => {
                    if (e.key === "Enter") {
                      e.preventDefault();
                      addVisitor();
                    }
                  }}
                />
              </Field>
              <Button type="button" disabled={!visitorName.trim()} onClick={addVisitor}>
                Add visitor
              </Button>
            </div>
            {rules?.values.twoPersonTransfer && people.length < 2 && (
              <p className="mt-2 font-semibold text-warn">
                The facility's rules require two people present for a transfer.
              </p>
            )}
          </FieldGroup>

          <FieldGroup legend="Safety checks">
            <label className="flex min-h-12 items-center gap-2">
              <input
                type="checkbox"
                className="h-6 w-6"
                checked={f.ppeConfirmed}
                onChange={(e) => set("ppeConfirmed", e.target.checked)}
              />
              PPE worn{ppe.length ? `: ${ppe.join(", ")}` : ""}
            </label>
            <label className="flex min-h-12 items-center gap-2">
              <input
                type="checkbox"
                className="h-6 w-6"
                checked={f.oxygenMonitorChecked}
                onChange={(e) => set("oxygenMonitorChecked", e.target.checked)}
              />
              Oxygen monitor checked before starting
            </label>
            <NumberField
              id="t-oxygen"
              label="Lowest oxygen reading during the transfer (%)"
              hint={rules ? `Facility alarm level ${rules.values.oxygenAlarmPercent} %` : undefined}
              value={f.oxygenLowest}
              onChange={(v) => set("oxygenLowest", v)}
            />
          </FieldGroup>

          <div className="grid gap-3 sm:grid-cols-2">
            <NumberField
              id="t-level-before"
              label="Level before (%)"
              value={f.levelBefore}
              onChange={(v) => set("levelBefore", v)}
            />
            <NumberField
              id="t-level-after"
              label="Level after (%)"
              value={f.levelAfter}
              onChange={(v) => set("levelAfter", v)}
            />
            <NumberField
              id="t-p-before"
              label="Pressure before (mbar)"
              value={f.pressureBefore}
              onChange={(v) => set("pressureBefore", v)}
            />
            <NumberField
              id="t-p-after"
              label="Pressure after (mbar)"
              value={f.pressureAfter}
              onChange={(v) => set("pressureAfter", v)}
            />
          </div>

          <FieldGroup legend="Taken from the supply">
            <ChoiceButtons
              className="mb-2 flex gap-2"
              label="Litres taken measured by"
              options={SUPPLIED_BY}
              value={f.suppliedBy}
              onChange={(m) => set("suppliedBy", m)}
            />
            {f.suppliedBy === "level" ? (
              <NumberField
                id="t-supplied"
                label="Litres taken from the supply"
                value={f.supplied}
                onChange={(v) => set("supplied", v)}
              />
            ) : (
              <div className="grid gap-3 sm:grid-cols-2">
                <NumberField
                  id="t-mass-before"
                  label="Supply dewar mass before (kg)"
                  value={f.massBefore}
                  onChange={(v) => set("massBefore", v)}
                />
                <NumberField
                  id="t-mass-after"
                  label="Supply dewar mass after (kg)"
                  hint={
                    suppliedLitres !== undefined
                      ? `≈ ${trim(suppliedLitres)} L of liquid (density 0.1247 kg/L: liquid at 1 atm, the normal boiling point)`
                      : undefined
                  }
                  value={f.massAfter}
                  onChange={(v) => set("massAfter", v)}
                />
              </div>
            )}
          </FieldGroup>

          <div className="grid gap-3 sm:grid-cols-2">
            <NumberField
              id="t-gained"
              label="Litres gained in the cryostat"
              hint={
                gainedFromLevels !== undefined
                  ? `From the level change: ${trim(gainedFromLevels)} L (leave empty to use it)`
                  : undefined
              }
              placeholder={gainedFromLevels !== undefined ? String(gainedFromLevels) : ""}
              value={f.gained}
              onChange={(v) => set("gained", v)}
            />
            <NumberField
              id="t-duration"
              label="Duration (min)"
              value={f.duration}
              onChange={(v) => set("duration", v)}
            />
          </div>
          <Field id="t-anomalies" label="Anomalies">
            <textarea
              id="t-anomalies"
              rows={3}
              className={INPUT_CLASS}
              value={f.anomalies}
              onChange={(e) => set("anomalies", e.target.value)}
            />
          </Field>

          {error && <ProblemNotice tone="danger" title={error.title} problems={error.problems} />}
          <Button type="submit" variant="primary" disabled={busy || !cid}>
            {busy ? "Saving…" : "Save transfer"}
          </Button>
        </form>
      </Panel>
      <div className="flex flex-col gap-4">
        <Panel aria-label="Computed figures">
          <h2 className="mb-2 text-lg font-bold">Computed</h2>
          {figures ? (
            <dl className="grid grid-cols-[1fr_auto] gap-x-3 gap-y-1">
              <dt>Transfer efficiency</dt>
              <dd className="num font-semibold" data-figure="efficiency">
                {figures.efficiencyPercent === null ? "—" : `${trim(figures.efficiencyPercent)} %`}
              </dd>
              <dt>Lost on the way (liquid)</dt>
              <dd className="num">{trim(figures.lossLitres)} L</dd>
              <dt>Gas to recovery (20 °C, 1 atm)</dt>
              <dd className="num">{trim(figures.gasToRecoveryLitres / 1000)} m³</dd>
              <dt>Boil-off since last transfer</dt>
              <dd className="num">
                {figures.boilOff
                  ? `${trim(figures.boilOff.litresPerDay)} L/day over ${trim(figures.boilOff.days)} d`
                  : "—"}
              </dd>
            </dl>
          ) : (
            <p className="text-muted">Enter the levels and litres to see efficiency, gas to recovery and boil-off.</p>
          )}
        </Panel>
        <Caution topic="transfer" cryostatId={cid || undefined} cryostatName={cryostat?.name} />
      </div>
    </div>
  );
}
