// CSV export of audited records (RFC 4180: CRLF lines, fields quoted when needed). Each row
// carries the record, its computed figures, its flags and every signature's manifestation
// (printed name, role, date-time UTC, meaning), as every view of a signed record shows it.
import type { ExportRecordBase, ExportSignature } from "./types";

export type CsvSignature = ExportSignature;
export type CsvRecord = ExportRecordBase & {
  peopleNames: string[];
  payload: Record<string, unknown>;
  efficiencyPercent: number | null;
  gasToRecoveryLitres: number | null;
  boilOffLitresPerDay: number | null;
  verdict: string | null;
  findings: string[];
  signatures: CsvSignature[];
};

export function csvField(v: unknown): string {
  if (v === null || v === undefined) return "";
  let s =
    typeof v === "number"
      ? Number.isFinite(v)
        ? String(v)
        : ""
      : typeof v === "boolean"
        ? v
          ? "yes"
          : "no"
        : String(v);
  // A cell starting with = + - @ would run as a formula in a spreadsheet: prefix it.
  if (/^[=+\-@\t\r]/.test(s) && typeof v !== "number") s = `'${s}`;
  return /[",\r\n]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s;
}

export const CSV_COLUMNS = [
  "record_id",
  "kind",
  "recorded_at_utc",
  "cryostat",
  "recorded_by",
  "people_present",
  "supply_dewar",
  "ppe_confirmed",
  "oxygen_monitor_checked",
  "oxygen_lowest_percent",
  "level_before_percent",
  "level_after_percent",
  "pressure_before_mbar",
  "pressure_after_mbar",
  "supplied_litres",
  "supplied_by",
  "gained_litres",
  "duration_min",
  "efficiency_percent",
  "gas_to_recovery_litres_20C_1atm",
  "boil_off_litres_per_day",
  "field_T",
  "helium_lost_litres",
  "anomalies_or_actions",
  "flags",
  "audit_verdict",
  "audit_findings",
  "signatures",
  "record_hash",
  "corrects_record_id",
  "correction_reason",
  "original_recorded_by",
  "original_recorded_at_utc",
  "original_as_recorded",
] as const;

const round = (x: number | null, d = 2) => (x === null ? null : Number(x.toFixed(d)));

export function recordsToCsv(records: readonly CsvRecord[]): string {
  const lines = [CSV_COLUMNS.join(",")];
  for (const r of records) {
    const p = r.payload;
    const row = [
      r.id,
      r.kind,
      r.recordedAt,
      r.cryostatName,
      r.authorName,
      r.peopleNames.join("; "),
      p.supplyDewar,
      p.ppeConfirmed,
      p.oxygenMonitorChecked,
      p.oxygenLowestPercent,
      p.levelBeforePercent,
      p.levelAfterPercent,
      p.pressureBeforeMbar,
      p.pressureAfterMbar,
      p.suppliedLitres,
      p.suppliedBy,
      p.gainedLitres,
      p.durationMin,
      round(r.efficiencyPercent, 1),
      round(r.gasToRecoveryLitres, 0),
      round(r.boilOffLitresPerDay, 2),
      p.fieldT,
      p.heliumLostLitres,
      [p.anomalies, p.actions, p.title, p.description].filter((x) => typeof x === "string" && x).join(" | "),
      r.flags.join("; "),
      r.verdict ?? "not audited",
      r.findings.join(" | "),
      r.signatures.map((s) => `${s.meaning} by ${s.signerName} (${s.signerRole}) at ${s.signedAt}`).join("; "),
      r.hash,
      r.correction?.originalId,
      r.correction?.reason,
      r.correction?.originalAuthorName,
      r.correction?.originalRecordedAt,
      r.correction?.original.join(" "),
    ];
    lines.push(row.map(csvField).join(","));
  }
  return `${lines.join("\r\n")}\r\n`;
}
