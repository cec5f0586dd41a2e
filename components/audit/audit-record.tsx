"use client";
// One record under audit: what was recorded, the computed figures, the automatic flags, every
// signature's manifestation, earlier findings, and the officer's finding form. The finding and its
// `audited` signature (stylus mark + PIN or password) are sent together and checked by the server.
import Link from "next/link";
import { useCallback, useEffect, useState } from "react";
import { EntryBody } from "@/components/logbook/entry-body";
import { Caution } from "@/components/safety/caution";
import { useMe } from "@/components/shell/use-me";
import { SignatureManifestation } from "@/components/signature/manifestation";
import { type Confirmation, SignDialog } from "@/components/signature/sign-dialog";
import { Button, buttonClass } from "@/components/ui/button";
import { ChoiceButtons } from "@/components/ui/form";
import { Loading, Notice, Panel, Tag } from "@/components/ui/panel";
import { api, problemText } from "@/components/ui/use-json";
import type { QuenchFigures, TransferFigures } from "@/lib/audit/figures";
import type { AuditItem, SignatureView } from "@/lib/audit/types";
import { formatDate, kindLabel, trim } from "@/lib/format";
import type { EntryInput } from "@/lib/schemas/entry";
import type { SessionUser } from "@/lib/schemas/user";
import { signatureEntry, signingSubject } from "@/lib/signing/sign";
import { FlagTags } from "./flag-tags";

const VERDICTS = [
  { value: "acceptable", label: "Acceptable" },
  { value: "needs_action", label: "Needs action" },
] as const;

function Manifest({ s }: { s: SignatureView }) {
  return (
    <SignatureManifestation
      sig={{
        signerName: s.signerName,
        signerRole: s.signerRole,
        signedAt: s.signedAt,
        meaning: s.meaning,
        confirmedBy: s.confirmedBy ?? undefined,
        image: s.image,
        valid: true,
      }}
    />
  );
}

/** A figure (number font) followed by its words, or `none` when there is no figure. */
function FigureText({ value, after, none = "—" }: { value: number | null; after: string; none?: string }) {
  return (
    <dd>
      {value === null ? (
        none
      ) : (
        <>
          <span className="num">{trim(value)}</span>
          {after}
        </>
      )}
    </dd>
  );
}

function Figures({ item }: { item: AuditItem }) {
  const f = item.figures;
  if (!f) return null;
  if ("lossLitres" in f) {
    const t = f as TransferFigures;
    return (
      <dl className="grid grid-cols-[auto_1fr] gap-x-4 gap-y-1">
        <dt className="text-muted">Efficiency</dt>
        <dd className="num font-semibold">{t.efficiencyPercent === null ? "—" : `${trim(t.efficiencyPercent)} %`}</dd>
        <dt className="text-muted">Lost on the way</dt>
        <dd className="num">
          {trim(t.lossLitres)} L liquid ≈ {trim(t.gasToRecoveryLitres / 1000)} m³ gas to recovery (20 °C, 1 atm)
        </dd>
        <dt className="text-muted">Boil-off since the previous transfer</dt>
        <dd className="num">
          {t.boilOff ? `${trim(t.boilOff.litresPerDay)} L/day over ${trim(t.boilOff.days)} days` : "—"}
        </dd>
      </dl>
    );
  }
  const q = f as QuenchFigures;
  return (
    <dl className="grid grid-cols-[auto_1fr] gap-x-4 gap-y-1">
      <dt className="text-muted">Helium lost (estimate)</dt>
      <FigureText value={q.heliumLostLitres} after={` L (${q.heliumLostBasis?.replaceAll("_", " ")})`} />
      <dt className="text-muted">Gas released (estimate)</dt>
      <FigureText value={q.gasM3} after=" m³ at 20 °C, 1 atm" />
      <dt className="text-muted">Room oxygen (estimate)</dt>
      <FigureText
        value={q.oxygenEstimateFraction === null ? null : q.oxygenEstimateFraction * 100}
        after=" % if mixed into the room"
        none="room volume not set in the facility rules"
      />
    </dl>
  );
}

export function AuditRecord({ id }: { id: string }) {
  const { me } = useMe();
  const [item, setItem] = useState<AuditItem | null>(null);
  const [error, setError] = useState<string | null>(null);
  const [verdict, setVerdict] = useState<"acceptable" | "needs_action">("acceptable");
  const [findings, setFindings] = useState("");
  const [signing, setSigning] = useState<EntryInput | null>(null);
  const [done, setDone] = useState<string | null>(null);

  const load = useCallback(async () => {
    try {
      setItem((await api<{ item: AuditItem }>(`/api/audit/records/${encodeURIComponent(id)}`)).item);
    } catch (e) {
      setError(problemText(e, "No connection to the server: the audit needs the network."));
    }
  }, [id]);
  useEffect(() => {
    void load();
  }, [load]);

  if (error) return <Notice tone="danger" role="alert" title={error} />;
  if (!item) return <Loading />;

  const officer = me?.role === "safety_officer";
  /** Sign the finding and send it with its signature; a refusal is shown in the dialog (thrown). */
  async function signFinding(finding: EntryInput, signer: SessionUser, c: Confirmation) {
    const subject = signingSubject(finding, signer, "audited");
    const proof = await c.prove(subject);
    const signature = signatureEntry({
      target: finding,
      subject,
      signer,
      deviceId: "audit-desk",
      image: c.image,
      confirmedBy: c.confirmedBy,
      proof,
    });
    try {
      await api("/api/audit/findings", { json: { finding, signature } });
    } catch (e) {
      throw new Error(problemText(e, "No connection to the server: the finding was not signed.", true));
    }
    setDone(`Finding signed: ${verdict === "acceptable" ? "acceptable" : "needs action"}.`);
    setFindings("");
    await load();
  }

  function startSigning() {
    if (!me || !item) return;
    setDone(null);
    setSigning({
      id: crypto.randomUUID(),
      cryostatId: item.entry.cryostatId,
      runId: null,
      kind: "audit.finding",
      payload: {
        targetEntryId: item.entry.id,
        verdict,
        findings: findings.trim(),
        flags: item.flags.map((f) => f.code),
      },
      authorId: me.id,
      deviceId: "audit-desk",
      recordedAt: new Date().toISOString(),
      supersedes: null,
      reason: null,
    });
  }

  return (
    <div className="grid gap-4 lg:grid-cols-[1fr_22rem]">
      <div className="flex flex-col gap-4">
        <Panel>
          <p className="text-sm text-muted">
            <Link href="/audit" className="inline-flex min-h-12 items-center underline">
              Audit
            </Link>{" "}
            / {kindLabel(item.entry.kind)}
          </p>
          <h2 className="text-2xl font-bold">
            {kindLabel(item.entry.kind)} on {item.cryostatName}
          </h2>
          <p className="text-muted">
            {formatDate(item.entry.recordedAt)} · recorded by {item.authorName}
            {item.peopleNames.length ? ` · present: ${item.peopleNames.join(", ")}` : ""}
          </p>
          {item.corrects && <CorrectedFrom item={item} corrects={item.corrects} />}
          <div className="mt-3">
            <EntryBody entry={item.entry} />
          </div>
          {item.entry.kind === "transfer" && (
            <p className="mt-2">
              PPE confirmed: <strong>{item.entry.payload.ppeConfirmed ? "yes" : "no"}</strong> · Oxygen monitor checked:{" "}
              <strong>{item.entry.payload.oxygenMonitorChecked ? "yes" : "no"}</strong>
            </p>
          )}
          <div className="mt-3">
            <Figures item={item} />
          </div>
          <h3 className="mt-4 font-bold">Automatic flags</h3>
          <FlagTags flags={item.flags} />
          <ul className="mt-1 ml-5 list-disc text-base">
            {item.flags.map((f) => (
              <li key={f.code}>{f.detail}</li>
            ))}
          </ul>
          <h3 className="mt-4 font-bold">Signatures on the record</h3>
          {item.signatures.length ? (
            <div className="flex flex-col gap-2">
              {item.signatures.map((s) => (
                <Manifest key={s.entryId} s={s} />
              ))}
            </div>
          ) : (
            <p className="text-warn">Nobody has signed this record.</p>
          )}
        </Panel>
        {item.findings.length > 0 && (
          <Panel>
            <h3 className="mb-2 text-lg font-bold">Audit findings</h3>
            {item.findings.map((f) => (
              <div key={f.id} className="mb-3" data-finding={f.id}>
                <p>
                  <Tag tone={f.verdict === "acceptable" ? "ok" : "danger"}>
                    {f.verdict === "acceptable" ? "Acceptable" : "Needs action"}
                  </Tag>{" "}
                  {f.authorName}, {formatDate(f.recordedAt)}
                </p>
                <p className="whitespace-pre-wrap">{f.findings || "(no text)"}</p>
                {f.signatures.map((s) => (
                  <Manifest key={s.entryId} s={s} />
                ))}
              </div>
            ))}
          </Panel>
        )}
        {officer && (
          <Panel>
            <h3 className="mb-2 text-lg font-bold">Your finding</h3>
            <ChoiceButtons
              className="mb-3 flex flex-wrap gap-2"
              label="Verdict"
              options={VERDICTS}
              value={verdict}
              onChange={setVerdict}
            />
            <label htmlFor="finding-text" className="font-semibold">
              Findings
            </label>
            <textarea
              id="finding-text"
              rows={4}
              value={findings}
              onChange={(e) => setFindings(e.target.value)}
              className="mt-1 w-full rounded-xl border-2 border-line bg-bg px-4 py-2 text-lg"
            />
            {done && <Notice tone="ok" role="status" title={done} />}
            <div className="mt-3 flex gap-2">
              <Button variant="primary" onClick={startSigning} disabled={!me}>
                Sign the finding
              </Button>
              <Link href="/audit" className={buttonClass("ghost")}>
                Back to the queue
              </Link>
            </div>
          </Panel>
        )}
        {signing && me && (
          <SignDialog
            me={me}
            meaning="audited"
            title="Sign the audit finding"
            onClose={() => setSigning(null)}
            onSign={(c) => signFinding(signing, me, c)}
          >
            <p>
              {kindLabel(item.entry.kind)} on {item.cryostatName}, {formatDate(item.entry.recordedAt)} — verdict{" "}
              <strong>{verdict === "acceptable" ? "acceptable" : "needs action"}</strong>.
            </p>
          </SignDialog>
        )}
      </div>
      <div>
        <Caution
          topic={item.entry.kind === "quench" ? "quench" : "transfer"}
          cryostatId={item.entry.cryostatId ?? undefined}
          cryostatName={item.cryostatName}
        />
      </div>
    </div>
  );
}

/** A correction shows what it replaces: the original as recorded, by whom and when, and why it was corrected. */
function CorrectedFrom({ item, corrects }: { item: AuditItem; corrects: NonNullable<AuditItem["corrects"]> }) {
  return (
    <div className="mt-3 rounded-xl border-2 border-warn p-3" data-testid="corrected-original">
      <p className="font-semibold">
        Correction by {item.authorName}, {formatDate(item.entry.recordedAt)}. Reason: {item.entry.reason}
      </p>
      <p className="mt-1 text-muted">
        Original recorded by {corrects.authorName}, {formatDate(corrects.entry.recordedAt)} (kept in the log):
      </p>
      <div className="mt-1 opacity-80">
        <EntryBody entry={corrects.entry} />
      </div>
      {corrects.signatures.length > 0 && (
        <p className="mt-1 text-sm text-muted">
          The original was signed by {corrects.signatures.map((s) => `${s.signerName} (${s.meaning})`).join(", ")}.
        </p>
      )}
    </div>
  );
}
