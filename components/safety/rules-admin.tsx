"use client";
// The facility admin's rules screen: the local values every caution and audit flag uses, the
// facility's own rules document (PDF), and the reason for each change (each save is an audited entry).
import { useCallback, useEffect, useState } from "react";
import { syncSoon } from "@/components/sync/runtime";
import { Button } from "@/components/ui/button";
import { FieldGroup, INPUT_CLASS, ProblemNotice, FieldRow as Row } from "@/components/ui/form";
import { Loading, Notice, Panel } from "@/components/ui/panel";
import { api, problemList, problemText } from "@/components/ui/use-json";
import { formatDate } from "@/lib/format";
import { useCryostats } from "@/lib/local/hooks";
import { RULES_DOCUMENT_MAX_BYTES } from "@/lib/safety/rules-document";
import type { FacilityRulesValues, RulesInForce } from "@/lib/schemas/rules";
import { typedNumber } from "@/lib/typed-number";

type RulesReply = { rules: RulesInForce | null };

export function RulesAdmin() {
  const [rules, setRules] = useState<RulesInForce | null>(null);
  const cryos = useCryostats() ?? [];
  const [v, setV] = useState<FacilityRulesValues | null>(null);
  const [text, setText] = useState({ ppe: "", contacts: "" });
  const [reason, setReason] = useState("");
  const [msg, setMsg] = useState<{ tone: "ok" | "danger"; text: string; details?: string[] } | null>(null);
  const [docMsg, setDocMsg] = useState<{ tone: "ok" | "danger"; text: string } | null>(null);
  const [busy, setBusy] = useState(false);

  const adopt = useCallback((r: RulesInForce | null) => {
    setRules(r);
    if (!r) return;
    setV(r.values);
    setText({
      ppe: r.values.ppe.join("\n"),
      contacts: r.values.contacts.map((c) => `${c.name} | ${c.role} | ${c.phone}`).join("\n"),
    });
  }, []);
  useEffect(() => {
    api<RulesReply>("/api/rules").then(
      (b) => adopt(b.rules),
      (e: unknown) => setMsg({ tone: "danger", text: problemText(e) }),
    );
  }, [adopt]);

  if (!v) return msg ? <Notice tone="danger" role="alert" title={msg.text} /> : <Loading />;
  const set = <K extends keyof FacilityRulesValues>(k: K, val: FacilityRulesValues[K]) =>
    setV((x) => (x ? { ...x, [k]: val } : x));
  const optNum = typedNumber;

  async function save() {
    if (!v) return;
    setBusy(true);
    setMsg(null);
    const values: FacilityRulesValues = {
      ...v,
      ppe: text.ppe
        .split("\n")
        .map((s) => s.trim())
        .filter(Boolean),
      contacts: text.contacts
        .split("\n")
        .map((l) => l.split("|").map((s) => s.trim()))
        .filter((p) => p.some(Boolean))
        .map(([name = "", role = "", phone = ""]) => ({ name, role, phone })),
    };
    try {
      const body = await api<{ rules: RulesInForce }>("/api/rules", {
        method: "PUT",
        json: { values, reason, expectedVersion: rules?.version ?? null },
      });
      adopt(body.rules);
      syncSoon(); // the cautions on this tablet read the rules from its store
      setReason("");
      setMsg({
        tone: "ok",
        text: `Saved as version ${body.rules.version}. The change is recorded in the facility log.`,
      });
    } catch (e) {
      setMsg({
        tone: "danger",
        text: problemText(e, "No connection to the server: nothing was changed."),
        details: problemList(e),
      });
    } finally {
      setBusy(false);
    }
  }

  async function upload(file: File) {
    setDocMsg(null);
    if (file.size > RULES_DOCUMENT_MAX_BYTES) {
      setDocMsg({
        tone: "danger",
        text: `"${file.name}" is ${(file.size / 1048576).toFixed(1)} MB; the limit is ${RULES_DOCUMENT_MAX_BYTES / 1048576} MB. Upload a smaller PDF.`,
      });
      return;
    }
    try {
      const body = await api<{ rules: RulesInForce & { document: NonNullable<RulesInForce["document"]> } }>(
        "/api/rules/document",
        {
          body: file,
          headers: {
            "x-rimelog-file-name": encodeURIComponent(file.name),
            "x-rimelog-reason": encodeURIComponent(reason),
          },
        },
      );
      adopt(body.rules);
      syncSoon(); // the cautions on this tablet read the rules from its store
      setDocMsg({
        tone: "ok",
        text: `"${body.rules.document.fileName}" is now the facility's rules document (version ${body.rules.version}).`,
      });
    } catch (e) {
      setDocMsg({
        tone: "danger",
        text: problemText(e, "No connection to the server: the document was not uploaded."),
      });
    }
  }

  return (
    <div className="grid gap-4 lg:grid-cols-[1fr_22rem]">
      <Panel>
        <form
          className="flex flex-col gap-4"
          noValidate
          onSubmit={(e) => {
            e.preventDefault();
            void save();
          }}
        >
          <Row id="r-name" label="Facility name">
            <input
              id="r-name"
              className={INPUT_CLASS}
              value={v.facilityName}
              onChange={(e) => set("facilityName", e.target.value)}
            />
          </Row>
          <div className="grid gap-3 sm:grid-cols-2">
            <Row id="r-alarm" label="Oxygen alarm level (%)">
              <input
                id="r-alarm"
                inputMode="decimal"
                className={`${INPUT_CLASS} num`}
                value={v.oxygenAlarmPercent}
                onChange={(e) => set("oxygenAlarmPercent", typedNumber(e.target.value) ?? 0)}
              />
            </Row>
            <Row id="r-evac" label="Oxygen level to leave the room (%)">
              <input
                id="r-evac"
                inputMode="decimal"
                className={`${INPUT_CLASS} num`}
                value={v.oxygenEvacuatePercent}
                onChange={(e) => set("oxygenEvacuatePercent", typedNumber(e.target.value) ?? 0)}
              />
            </Row>
          </div>
          <label className="flex min-h-12 items-center gap-2 font-semibold">
            <input
              type="checkbox"
              className="h-6 w-6"
              checked={v.twoPersonTransfer}
              onChange={(e) => set("twoPersonTransfer", e.target.checked)}
            />
            Two people must be present for cryogen transfers
          </label>
          <Row id="r-ppe" label="Required PPE (one per line)">
            <textarea
              id="r-ppe"
              rows={4}
              className={INPUT_CLASS}
              value={text.ppe}
              onChange={(e) => setText((t) => ({ ...t, ppe: e.target.value }))}
            />
          </Row>
          <FieldGroup legend="Per cryostat">
            <div className="grid gap-3 sm:grid-cols-2">
              {cryos.map((c) => (
                <div key={c.id} className="flex flex-col gap-2">
                  <p className="font-semibold">{c.name}</p>
                  {Boolean(c.config.reservoir) && (
                    <Row id={`r-min-${c.id}`} label="Minimum helium level (%)">
                      <input
                        id={`r-min-${c.id}`}
                        inputMode="decimal"
                        className={`${INPUT_CLASS} num`}
                        value={v.minHeliumPercent[c.id] ?? ""}
                        onChange={(e) =>
                          set(
                            "minHeliumPercent",
                            Object.fromEntries(
                              Object.entries({ ...v.minHeliumPercent, [c.id]: optNum(e.target.value) }).filter(
                                ([, x]) => x !== undefined,
                              ),
                            ) as Record<string, number>,
                          )
                        }
                      />
                    </Row>
                  )}
                  {Boolean(c.config.magnet) && (
                    <Row id={`r-ramp-${c.id}`} label="Maximum ramp rate (T/min)">
                      <input
                        id={`r-ramp-${c.id}`}
                        inputMode="decimal"
                        className={`${INPUT_CLASS} num`}
                        value={v.maxRampTPerMin[c.id] ?? ""}
                        onChange={(e) =>
                          set(
                            "maxRampTPerMin",
                            Object.fromEntries(
                              Object.entries({ ...v.maxRampTPerMin, [c.id]: optNum(e.target.value) }).filter(
                                ([, x]) => x !== undefined,
                              ),
                            ) as Record<string, number>,
                          )
                        }
                      />
                    </Row>
                  )}
                </div>
              ))}
            </div>
          </FieldGroup>
          <div className="grid gap-3 sm:grid-cols-2">
            <Row
              id="r-mt"
              label="Controlled-area field line (mT)"
              hint="0.5 mT is common; some standards use 0.9 mT. Set your facility's own."
            >
              <input
                id="r-mt"
                inputMode="decimal"
                className={`${INPUT_CLASS} num`}
                value={v.controlledAreaMilliTesla}
                onChange={(e) => set("controlledAreaMilliTesla", typedNumber(e.target.value) ?? 0)}
              />
            </Row>
            <Row id="r-days" label="Warn when helium reaches the minimum within (days)">
              <input
                id="r-days"
                inputMode="numeric"
                className={`${INPUT_CLASS} num`}
                value={v.forecastWarnDays}
                onChange={(e) => set("forecastWarnDays", typedNumber(e.target.value) ?? 0)}
              />
            </Row>
            <Row id="r-effmin" label="Plausible transfer efficiency, lowest (%)" hint="Default 40 % when empty.">
              <input
                id="r-effmin"
                inputMode="decimal"
                className={`${INPUT_CLASS} num`}
                value={v.transferEfficiencyMinPercent ?? ""}
                onChange={(e) => set("transferEfficiencyMinPercent", optNum(e.target.value))}
              />
            </Row>
            <Row id="r-effmax" label="Plausible transfer efficiency, highest (%)" hint="Default 95 % when empty.">
              <input
                id="r-effmax"
                inputMode="decimal"
                className={`${INPUT_CLASS} num`}
                value={v.transferEfficiencyMaxPercent ?? ""}
                onChange={(e) => set("transferEfficiencyMaxPercent", optNum(e.target.value))}
              />
            </Row>
            <Row id="r-vol" label="Room free volume (m³)" hint="For the oxygen estimate after a quench.">
              <input
                id="r-vol"
                inputMode="decimal"
                className={`${INPUT_CLASS} num`}
                value={v.roomFreeVolumeM3 ?? ""}
                onChange={(e) => set("roomFreeVolumeM3", optNum(e.target.value))}
              />
            </Row>
            <Row id="r-ach" label="Room ventilation (air changes per hour)">
              <input
                id="r-ach"
                inputMode="decimal"
                className={`${INPUT_CLASS} num`}
                value={v.roomAirChangesPerHour ?? ""}
                onChange={(e) => set("roomAirChangesPerHour", optNum(e.target.value))}
              />
            </Row>
          </div>
          <Row id="r-note" label="Controlled-area note">
            <textarea
              id="r-note"
              rows={2}
              className={INPUT_CLASS}
              value={v.controlledAreaNote}
              onChange={(e) => set("controlledAreaNote", e.target.value)}
            />
          </Row>
          <Row id="r-contacts" label="Emergency contacts (one per line: name | role | phone)">
            <textarea
              id="r-contacts"
              rows={4}
              className={INPUT_CLASS}
              value={text.contacts}
              onChange={(e) => setText((t) => ({ ...t, contacts: e.target.value }))}
            />
          </Row>
          <Row id="r-reason" label="Reason for the change" hint="Recorded with the change in the facility log.">
            <input id="r-reason" className={INPUT_CLASS} value={reason} onChange={(e) => setReason(e.target.value)} />
          </Row>
          {msg && <ProblemNotice tone={msg.tone} title={msg.text} problems={msg.details} />}
          <Button type="submit" variant="primary" disabled={busy}>
            {busy ? "Saving…" : "Save the rules"}
          </Button>
        </form>
      </Panel>
      <div className="flex flex-col gap-4">
        <Panel>
          <h2 className="mb-2 text-lg font-bold">In force</h2>
          {rules && (
            <p>
              Version {rules.version}, changed {formatDate(rules.changedAt)} by {rules.changedByName}.
            </p>
          )}
        </Panel>
        <Panel>
          <h2 className="mb-2 text-lg font-bold">The facility's rules document</h2>
          {rules?.document ? (
            <p className="mb-2">
              <a
                href="/api/rules/document"
                className="inline-flex min-h-12 items-center font-semibold text-accent underline"
              >
                {rules.document.fileName}
              </a>{" "}
              <span className="num text-sm text-muted">({(rules.document.bytes / 1024).toFixed(0)} KB)</span>
            </p>
          ) : (
            <p className="mb-2 text-muted">None uploaded yet.</p>
          )}
          <label htmlFor="r-doc" className="font-semibold">
            Upload a new PDF (up to {RULES_DOCUMENT_MAX_BYTES / 1048576} MB)
          </label>
          <input
            id="r-doc"
            type="file"
            accept="application/pdf,.pdf"
            className="mt-1 block min-h-12 w-full"
            onChange={(e) => e.target.files?.[0] && void upload(e.target.files[0])}
          />
          {docMsg && (
            <div className="mt-2">
              <Notice tone={docMsg.tone} role={docMsg.tone === "danger" ? "alert" : "status"} title={docMsg.text} />
            </div>
          )}
        </Panel>
      </div>
    </div>
  );
}
