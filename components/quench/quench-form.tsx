"use client";
// Quench and incident entries on the tablet (offline-capable through the tablet store). The helium
// lost and the room's oxygen figure are computed as estimates; both kinds always go to the safety
// officer's audit queue.
import { useMemo, useState } from "react";
import { Caution } from "@/components/safety/caution";
import { Button } from "@/components/ui/button";
import { ChoiceButtons, FieldRow, INPUT_CLASS, NumberField, OptionList, ProblemNotice } from "@/components/ui/form";
import { Panel } from "@/components/ui/panel";
import { quenchFigures } from "@/lib/audit/figures";
import { trim } from "@/lib/format";
import { useCryostats, useFacilityRules } from "@/lib/local/hooks";
import { LocalWriteError, recordEntry } from "@/lib/local/record";
import { heliumLostText, oxygenEstimateText } from "@/lib/safety/estimates";
import { typedNumber } from "@/lib/typed-number";

const MODES = [
  { value: "quench", label: "Magnet quench" },
  { value: "incident", label: "Other incident" },
] as const;
const n = typedNumber;
const localNow = () => {
  const d = new Date();
  return new Date(d.getTime() - d.getTimezoneOffset() * 60_000).toISOString().slice(0, 16);
};

export function QuenchForm() {
  const cryostats = useCryostats();
  const rules = useFacilityRules();
  const [mode, setMode] = useState<"quench" | "incident">("quench");
  const [cryostatId, setCryostatId] = useState("");
  const list = mode === "quench" ? (cryostats ?? []).filter((c) => c.config.magnet) : (cryostats ?? []);
  const cid = list.some((c) => c.id === cryostatId) ? cryostatId : (list[0]?.id ?? "");
  const cryostat = list.find((c) => c.id === cid);
  const [f, setF] = useState({
    at: localNow(),
    fieldT: "",
    currentA: "",
    levelBefore: "",
    levelAfter: "",
    lost: "",
    oxygen: "",
    actions: "",
    title: "",
    description: "",
  });
  const set = (k: keyof typeof f, v: string) => setF((x) => ({ ...x, [k]: v }));
  const [msg, setMsg] = useState<{ tone: "ok" | "danger"; title: string; problems?: string[] } | null>(null);

  const figures = useMemo(() => {
    if (mode !== "quench" || n(f.fieldT) === undefined) return null;
    try {
      return quenchFigures(
        {
          fieldT: n(f.fieldT)!,
          currentA: n(f.currentA),
          levelBeforePercent: n(f.levelBefore),
          levelAfterPercent: n(f.levelAfter),
          heliumLostLitres: n(f.lost),
        },
        {
          calibration: cryostat?.config.reservoir?.calibration,
          inductanceH: cryostat?.config.magnet?.inductanceH,
          roomFreeVolumeM3: rules?.values.roomFreeVolumeM3,
        },
      );
    } catch {
      return null;
    }
  }, [mode, f, cryostat, rules]);

  async function save() {
    setMsg(null);
    try {
      if (mode === "quench") {
        const lost =
          n(f.lost) ??
          (figures?.heliumLostLitres !== null && figures?.heliumLostBasis === "levels"
            ? Number(figures.heliumLostLitres.toFixed(1))
            : undefined);
        await recordEntry({
          cryostatId: cid,
          kind: "quench",
          payload: {
            at: new Date(f.at).toISOString(),
            fieldT: n(f.fieldT) ?? Number.NaN,
            ...(n(f.currentA) !== undefined ? { currentA: n(f.currentA) } : {}),
            ...(n(f.levelBefore) !== undefined ? { levelBeforePercent: n(f.levelBefore) } : {}),
            ...(n(f.levelAfter) !== undefined ? { levelAfterPercent: n(f.levelAfter) } : {}),
            ...(lost !== undefined ? { heliumLostLitres: lost } : {}),
            ...(n(f.oxygen) !== undefined ? { oxygenLowestPercent: n(f.oxygen) } : {}),
            actions: f.actions,
          },
        });
      } else {
        await recordEntry({
          cryostatId: cid,
          kind: "incident",
          payload: { title: f.title, description: f.description, actions: f.actions },
        });
      }
      setMsg({
        tone: "ok",
        title: `${mode === "quench" ? "Quench" : "Incident"} saved on this tablet. It goes to the safety officer with the next sync.`,
      });
    } catch (e) {
      setMsg({ tone: "danger", title: (e as Error).message, problems: e instanceof LocalWriteError ? e.problems : [] });
    }
  }

  const field = (id: keyof typeof f, label: string) => (
    <NumberField id={`q-${id}`} label={label} value={f[id]} onChange={(v) => set(id, v)} />
  );

  return (
    <div className="grid gap-4 lg:grid-cols-[1fr_24rem]">
      <Panel>
        <ChoiceButtons
          className="mb-3 flex gap-2"
          label="What happened"
          options={MODES}
          value={mode}
          onChange={setMode}
        />
        <form
          className="flex flex-col gap-3"
          noValidate
          onSubmit={(e) => {
            e.preventDefault();
            void save();
          }}
        >
          <FieldRow id="q-cryostat" label="Cryostat">
            <select id="q-cryostat" className={INPUT_CLASS} value={cid} onChange={(e) => setCryostatId(e.target.value)}>
              <OptionList options={list.map((c) => ({ value: c.id, label: c.name }))} />
            </select>
          </FieldRow>
          {mode === "quench" ? (
            <>
              <FieldRow id="q-at" label="Time of the quench">
                <input
                  id="q-at"
                  type="datetime-local"
                  className={INPUT_CLASS}
                  value={f.at}
                  onChange={(e) => set("at", e.target.value)}
                />
              </FieldRow>
              <div className="grid gap-3 sm:grid-cols-2">
                {field("fieldT", "Field at quench (T)")}
                {field("currentA", "Current at quench (A)")}
                {field("levelBefore", "Helium level before (%)")}
                {field("levelAfter", "Helium level after (%)")}
                {field("lost", "Helium lost (L), if measured otherwise")}
                {field("oxygen", "Lowest oxygen reading (%)")}
              </div>
            </>
          ) : (
            <>
              <FieldRow id="q-title" label="What happened (short title)">
                <input
                  id="q-title"
                  inputMode="text"
                  className={INPUT_CLASS}
                  value={f.title}
                  onChange={(e) => set("title", e.target.value)}
                />
              </FieldRow>
              <FieldRow id="q-description" label="Description">
                <textarea
                  id="q-description"
                  rows={3}
                  className={INPUT_CLASS}
                  value={f.description}
                  onChange={(e) => set("description", e.target.value)}
                />
              </FieldRow>
            </>
          )}
          <FieldRow id="q-actions" label="Actions taken">
            <textarea
              id="q-actions"
              rows={3}
              className={INPUT_CLASS}
              value={f.actions}
              onChange={(e) => set("actions", e.target.value)}
            />
          </FieldRow>
          {msg && <ProblemNotice tone={msg.tone} title={msg.title} problems={msg.problems} />}
          <Button type="submit" variant="primary" disabled={!cid}>
            Save {mode === "quench" ? "quench" : "incident"}
          </Button>
        </form>
      </Panel>
      <div className="flex flex-col gap-4">
        {mode === "quench" && (
          <Panel aria-label="Estimates">
            <h2 className="mb-2 text-lg font-bold">Estimates</h2>
            {figures?.heliumLostLitres != null ? (
              <p data-figure="helium-lost">
                {heliumLostText(
                  figures.heliumLostLitres,
                  figures.heliumLostBasis === "levels"
                    ? "from the level before and after"
                    : figures.heliumLostBasis === "recorded"
                      ? "as entered"
                      : "upper bound from the stored energy ½ L I²",
                )}
              </p>
            ) : (
              <p className="text-muted">Enter the field and the levels (or current) to estimate the helium lost.</p>
            )}
            {figures?.gasM3 != null && (
              <p className="mt-1">
                ≈ <span className="num">{trim(figures.gasM3)}</span> m³ of helium gas at 20 °C, 1 atm.
              </p>
            )}
            {figures?.oxygenEstimateFraction != null && rules && (
              <p data-figure="oxygen-estimate" className="mt-1">
                {oxygenEstimateText(
                  figures.oxygenEstimateFraction,
                  rules.values,
                  `${trim(figures.gasM3 ?? 0)} m³ mixed into the room's ${rules.values.roomFreeVolumeM3} m³`,
                )}
              </p>
            )}
            {figures && figures.gasM3 != null && !rules?.values.roomFreeVolumeM3 && (
              <p className="mt-1 text-muted">
                No oxygen estimate: the room's free volume is not set in the facility rules.
              </p>
            )}
          </Panel>
        )}
        <Caution topic="quench" cryostatId={cid || undefined} cryostatName={cryostat?.name} />
      </div>
    </div>
  );
}
