// CSV (RFC 4180 quoting, no spreadsheet formulas) and the PDF audit report (pdf-lib reads it back:
// pages, title, and every signature manifestation present in the content).
import { inflateSync } from "node:zlib";
import { PDFDocument } from "pdf-lib";
import { describe, expect, it } from "vitest";
import { CSV_COLUMNS, type CsvRecord, csvField, recordsToCsv } from "@/lib/export/csv";
import { auditReportPdf, manifestation, type ReportRecord, winAnsi } from "@/lib/export/pdf";

const rec: CsvRecord = {
  id: "r1",
  correction: null,
  kind: "transfer",
  recordedAt: "2026-11-20T10:00:00.000Z",
  cryostatName: "Plover",
  authorName: "Tomasz Okafor",
  peopleNames: ["Tomasz Okafor"],
  payload: {
    supplyDewar: "D-250-A",
    ppeConfirmed: true,
    oxygenMonitorChecked: false,
    suppliedLitres: 60,
    gainedLitres: 45,
    anomalies: 'Said "alone", then left',
  },
  efficiencyPercent: 75,
  gasToRecoveryLitres: 11244,
  boilOffLitresPerDay: 5.1,
  flags: ["Single person", "Oxygen check missing"],
  verdict: "needs_action",
  findings: ['=HYPERLINK("x")'],
  signatures: [
    {
      meaning: "audited",
      signerName: "Dr. Grace Oyelaran",
      signerRole: "safety_officer",
      signedAt: "2026-11-21T09:00:00.000Z",
    },
  ],
  hash: "a".repeat(64),
};

describe("CSV", () => {
  it("quotes commas, quotes and newlines (RFC 4180) and defuses formulas", () => {
    expect(csvField('a "b", c')).toBe('"a ""b"", c"');
    expect(csvField("line\nnext")).toBe('"line\nnext"');
    expect(csvField("=SUM(A1)")).toBe("'=SUM(A1)");
    expect(csvField(-3)).toBe("-3");
    expect(csvField(true)).toBe("yes");
  });
  it("writes a header and one CRLF row per record with flags and the signature manifestation", () => {
    const csv = recordsToCsv([rec]);
    const lines = csv.split("\r\n");
    expect(lines[0]).toBe(CSV_COLUMNS.join(","));
    expect(lines).toHaveLength(3);
    expect(lines[1]).toContain("Single person; Oxygen check missing");
    expect(lines[1]).toContain("audited by Dr. Grace Oyelaran (safety_officer) at 2026-11-21T09:00:00.000Z");
    expect(lines[1]).toContain('"Said ""alone"", then left"');
    expect(lines[1]).toContain(`"'=HYPERLINK(""x"")"`);
    expect(lines[1]!.split(",").length).toBeGreaterThanOrEqual(CSV_COLUMNS.length);
  });
});

function pdfText(bytes: Uint8Array): string {
  // Content streams are Flate-compressed: inflate each and join, enough to find the drawn strings.
  const s = Buffer.from(bytes).toString("latin1");
  const out: string[] = [];
  const re = /stream\r?\n/g;
  for (let m = re.exec(s); m !== null; m = re.exec(s)) {
    const start = m.index + m[0].length;
    const end = s.indexOf("endstream", start);
    try {
      out.push(inflateSync(Buffer.from(s.slice(start, end), "latin1")).toString("latin1"));
    } catch {
      /* not compressed */
    }
  }
  return out.join("\n");
}

describe("PDF audit report", () => {
  it("holds every record, flag and signature manifestation and reads back with pdf-lib", async () => {
    const r: ReportRecord = {
      id: "r1",
      correction: null,
      kind: "transfer",
      title: "Helium transfer",
      recordedAt: rec.recordedAt,
      cryostatName: "Plover",
      authorName: "Tomasz Okafor",
      lines: ["Supply dewar D-250-A; people present: Tomasz Okafor."],
      figures: ["Efficiency 75.0 %"],
      flags: ["Single person (1 person recorded as present)"],
      findings: [
        {
          verdict: "needs_action",
          text: "Second person required.",
          by: "Dr. Grace Oyelaran",
          at: "2026-11-21T09:00:00.000Z",
          signatures: rec.signatures.map((s) => ({ ...s, confirmedBy: "password" })),
        },
      ],
      signatures: [],
      hash: rec.hash,
    };
    const corrected: ReportRecord = {
      ...r,
      id: "r-corr",
      authorName: "Priya Lindqvist",
      correction: {
        originalId: "r-orig",
        originalRecordedAt: "2026-11-20T09:00:00.000Z",
        originalAuthorName: "Tomasz Okafor",
        reason: "Gained litres mistyped",
        original: ["Taken from the supply 60 L (by level); gained 4 L."],
      },
    };
    const many = [corrected, ...Array.from({ length: 30 }, (_, i) => ({ ...r, id: `r${i}` }))];
    const bytes = await auditReportPdf({
      facilityName: "Low-Temperature Hall B-014",
      from: "2026-11-01T00:00:00.000Z",
      to: "2026-11-30T23:59:59.000Z",
      generatedAt: "2026-11-30T12:00:00.000Z",
      generatedBy: "Dr. Grace Oyelaran (safety officer)",
      records: many,
      chains: [{ chain: "plover", ok: true, count: 120, message: "Signed checkpoints checked: 1." }],
      deferral: "Follow the facility's rules.",
    });
    expect(Buffer.from(bytes.subarray(0, 5)).toString("latin1")).toBe("%PDF-");
    const doc = await PDFDocument.load(bytes);
    expect(doc.getPageCount()).toBeGreaterThan(1);
    expect(doc.getTitle()).toBe("Audit report 2026-11-01 to 2026-11-30");
    const text = pdfText(bytes);
    const hex = (s: string) => Buffer.from(winAnsi(s), "latin1").toString("hex").toUpperCase();
    // pdf-lib writes shown text as hex strings: look for the manifestation and a flag.
    expect(text).toContain(hex("Dr. Grace Oyelaran (safety officer), 2026-11-21 09:00 UTC"));
    expect(text).toContain(hex("AUDITED"));
    expect(text).toContain(hex("Flags: Single person"));
    // A correction names its original, who recorded it, and why it was corrected.
    expect(text).toContain(hex("CORRECTION by Priya Lindqvist"));
    expect(text).toContain(hex("Original as recorded (kept in the log):"));
    expect(manifestation(rec.signatures[0]!)).toMatch(
      /AUDITED — Dr. Grace Oyelaran \(safety officer\), 2026-11-21 09:00 UTC; identity not confirmed/,
    );
  });
  it("maps symbols the standard fonts cannot draw", () => {
    expect(winAnsi("≈ 5 → 6 ≥ 7 Hallström")).toBe("~ 5 -> 6 >= 7 Hallström");
  });
});
