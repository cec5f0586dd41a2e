// From the audit view of a record (db/queries/audit.ts AuditItem) to the rows of the CSV and the
// sections of the PDF report: the same fields, flags and signature manifestations in both.

import type { QuenchFigures, TransferFigures } from "@/lib/audit/figures";
import type { AuditItem, SignatureView } from "@/lib/audit/types";
import { kindLabel } from "@/lib/format";
import { payloadOf, type StoredEntry } from "@/lib/schemas/entry";
import type { CsvRecord } from "./csv";
import type { ReportRecord, ReportSignature } from "./pdf";
import type { ExportCorrection } from "./types";

const sig = (s: SignatureView & { confirmedBy?: string | null }): ReportSignature => ({
  meaning: s.meaning,
  signerName: s.signerName,
  signerRole: s.signerRole,
  signedAt: s.signedAt,
  confirmedBy: s.confirmedBy ?? null,
});
const num = (x: unknown, unit: string) =>
  typeof x === "number" ? `${Number(x.toPrecision(4))} ${unit}` : "not recorded";
const isTransfer = (f: AuditItem["figures"]): f is TransferFigures => Boolean(f && "lossLitres" in f);
const isQuench = (f: AuditItem["figures"]): f is QuenchFigures => Boolean(f && "heliumLostBasis" in f);

/** The correction's original, as the CSV and PDF show it beside the correction. */
function correctionOf(i: AuditItem): ExportCorrection | null {
  const o = i.corrects;
  if (!o) return null;
  return {
    originalId: o.entry.id,
    originalRecordedAt: o.entry.recordedAt,
    originalAuthorName: o.authorName,
    reason: i.entry.reason ?? "",
    original: [
      ...recordLines(o.entry, o.peopleNames),
      ...o.signatures.map((s) => `Signed ${s.meaning} by ${s.signerName} (${s.signerRole}) at ${s.signedAt}.`),
    ],
  };
}

export function toCsvRecord(i: AuditItem): CsvRecord {
  const t = isTransfer(i.figures) ? i.figures : null;
  return {
    id: i.entry.id,
    correction: correctionOf(i),
    kind: i.entry.kind,
    recordedAt: i.entry.recordedAt,
    cryostatName: i.cryostatName,
    authorName: i.authorName,
    peopleNames: i.peopleNames,
    payload: i.entry.payload,
    efficiencyPercent: t?.efficiencyPercent ?? null,
    gasToRecoveryLitres: t?.gasToRecoveryLitres ?? null,
    boilOffLitresPerDay: t?.boilOff?.litresPerDay ?? null,
    flags: i.flags.map((f) => f.label),
    verdict: i.verdict,
    findings: i.findings.map((f) => `${f.verdict} by ${f.authorName}: ${f.findings}`),
    signatures: [...i.signatures, ...i.findings.flatMap((f) => f.signatures)].map(sig),
    hash: i.entry.hash,
  };
}

/** What a transfer, quench or incident says, in the words of the report (also for a correction's original). */
function recordLines(entry: StoredEntry, peopleNames: string[]): string[] {
  const lines: string[] = [];
  if (entry.kind === "transfer") {
    const p = entry.payload;
    lines.push(
      `Supply dewar ${String(p.supplyDewar)}; people present: ${peopleNames.join(", ") || "none recorded"}.`,
      `PPE confirmed: ${p.ppeConfirmed ? "yes" : "NO"}. Oxygen monitor checked: ${p.oxygenMonitorChecked ? "yes" : "NO"}; lowest reading ${num(p.oxygenLowestPercent, "%")}.`,
      `Level ${num(p.levelBeforePercent, "%")} -> ${num(p.levelAfterPercent, "%")}; pressure ${num(p.pressureBeforeMbar, "mbar")} -> ${num(p.pressureAfterMbar, "mbar")}.`,
      `Taken from the supply ${num(p.suppliedLitres, "L")} (by ${String(p.suppliedBy)}); gained ${num(p.gainedLitres, "L")}; duration ${num(p.durationMin, "min")}.`,
    );
    if (p.anomalies) lines.push(`Anomalies: ${String(p.anomalies)}`);
  } else if (entry.kind === "quench") {
    const p = entry.payload;
    lines.push(
      `Quench at ${String(p.at)} at ${num(p.fieldT, "T")}${typeof p.currentA === "number" ? `, ${p.currentA} A` : ""}; level ${num(p.levelBeforePercent, "%")} -> ${num(p.levelAfterPercent, "%")}; lowest oxygen ${num(p.oxygenLowestPercent, "%")}.`,
    );
    lines.push(`Actions: ${String(p.actions || "none recorded")}`);
  } else {
    const p = payloadOf(entry, "incident");
    lines.push(`${String(p?.title)}: ${String(p?.description)}`, `Actions: ${String(p?.actions || "none recorded")}`);
  }
  return lines;
}

export function toReportRecord(i: AuditItem): ReportRecord {
  const lines = recordLines(i.entry, i.peopleNames);
  const figures: string[] = [];
  if (i.entry.kind === "transfer") {
    const t = isTransfer(i.figures) ? i.figures : null;
    if (t) {
      figures.push(
        `Efficiency ${t.efficiencyPercent === null ? "-" : `${t.efficiencyPercent.toFixed(1)} %`}; lost on the way ${t.lossLitres.toFixed(1)} L liquid = ${(t.gasToRecoveryLitres / 1000).toFixed(2)} m³ gas to recovery (20 °C, 1 atm).`,
      );
      if (t.boilOff)
        figures.push(
          `Boil-off since the previous transfer: ${t.boilOff.litresPerDay.toFixed(2)} L/day over ${t.boilOff.days.toFixed(1)} days.`,
        );
    }
  } else if (i.entry.kind === "quench") {
    const q = isQuench(i.figures) ? i.figures : null;
    if (q?.heliumLostLitres != null)
      figures.push(
        `Estimate: helium lost ${q.heliumLostLitres.toFixed(1)} L (${q.heliumLostBasis?.replaceAll("_", " ")}), ${q.gasM3?.toFixed(1)} m³ of gas (20 °C, 1 atm).`,
      );
    if (q?.oxygenEstimateFraction != null)
      figures.push(
        `Estimate: room oxygen about ${(q.oxygenEstimateFraction * 100).toFixed(1)} % if the gas mixed into the room.`,
      );
  }
  return {
    id: i.entry.id,
    correction: correctionOf(i),
    kind: i.entry.kind,
    title: kindLabel(i.entry.kind),
    recordedAt: i.entry.recordedAt,
    cryostatName: i.cryostatName,
    authorName: i.authorName,
    lines,
    figures,
    flags: i.flags.map((f) => `${f.label} (${f.detail})`),
    findings: i.findings.map((f) => ({
      verdict: f.verdict,
      text: f.findings,
      by: f.authorName,
      at: f.recordedAt,
      signatures: f.signatures.map(sig),
    })),
    signatures: i.signatures.map(sig),
    hash: i.entry.hash,
  };
}
