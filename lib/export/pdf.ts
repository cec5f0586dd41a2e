// The audit report as PDF (pdf-lib, pure JS): a period's transfers, quenches and incidents, each
// with its figures, flags, findings and every signature's manifestation (printed name, role, date
// and time, meaning — as on every screen), plus the chain check of each cryostat. Standard fonts
// only (no files).
import { PDFDocument, type PDFFont, type PDFPage, rgb, StandardFonts } from "pdf-lib";
import type { ExportRecordBase, ExportSignature } from "./types";

export type ReportSignature = ExportSignature & { confirmedBy?: string | null };
export type ReportRecord = ExportRecordBase & {
  title: string;
  lines: string[];
  figures: string[];
  findings: { verdict: string; text: string; by: string; at: string; signatures: ReportSignature[] }[];
  signatures: ReportSignature[];
};
export type ReportChain = { chain: string; ok: boolean; count: number; message: string };
export type ReportInput = {
  facilityName: string;
  from: string;
  to: string;
  generatedAt: string;
  generatedBy: string;
  records: ReportRecord[];
  chains: ReportChain[];
  deferral: string;
};

const A4: [number, number] = [595.28, 841.89];
const MARGIN = 50;

/** Standard PDF fonts encode WinAnsi only: map the few symbols we use, drop anything else. */
export function winAnsi(text: string): string {
  const map: Record<string, string> = {
    "≈": "~",
    "≥": ">=",
    "≤": "<=",
    "→": "->",
    "−": "-",
    "·": "·",
    "½": "1/2",
    "³": "³",
    "…": "...",
    "\u2009": " ",
    "\u00a0": " ",
  };
  return [...text.normalize("NFC")]
    .map((c) => map[c] ?? c)
    .join("")
    .replace(/[^\x20-\x7e\xa0-\xff\u2013\u2014\u2018\u2019\u201c\u201d\u2022\u20ac]/g, "?");
}

function wrap(text: string, font: PDFFont, size: number, width: number): string[] {
  const out: string[] = [];
  for (const para of winAnsi(text).split("\n")) {
    let line = "";
    for (const word of para.split(/\s+/)) {
      const next = line ? `${line} ${word}` : word;
      if (font.widthOfTextAtSize(next, size) <= width) line = next;
      else {
        if (line) out.push(line);
        line = word;
        while (font.widthOfTextAtSize(line, size) > width && line.length > 1) {
          let cut = line.length - 1;
          while (cut > 1 && font.widthOfTextAtSize(line.slice(0, cut), size) > width) cut--;
          out.push(line.slice(0, cut));
          line = line.slice(cut);
        }
      }
    }
    out.push(line);
  }
  return out;
}

const when = (iso: string) => `${iso.slice(0, 16).replace("T", " ")} UTC`;
export function manifestation(s: ReportSignature): string {
  const how =
    s.confirmedBy === "pin"
      ? "identity confirmed with PIN"
      : s.confirmedBy === "password"
        ? "identity confirmed with password"
        : "identity not confirmed";
  return `${s.meaning.replace("_", " ").toUpperCase()} — ${s.signerName} (${s.signerRole.replace("_", " ")}), ${when(s.signedAt)}; ${how}`;
}

export async function auditReportPdf(input: ReportInput): Promise<Uint8Array> {
  const doc = await PDFDocument.create();
  doc.setTitle(`Audit report ${input.from.slice(0, 10)} to ${input.to.slice(0, 10)}`);
  doc.setSubject(`Helium transfers, quenches and incidents — ${winAnsi(input.facilityName)}`);
  doc.setProducer("Rimelog");
  doc.setCreator("Rimelog");
  doc.setCreationDate(new Date(input.generatedAt));
  const regular = await doc.embedFont(StandardFonts.Helvetica);
  const bold = await doc.embedFont(StandardFonts.HelveticaBold);
  const width = A4[0] - 2 * MARGIN;
  let page: PDFPage = doc.addPage(A4);
  let y = A4[1] - MARGIN;

  const newPage = () => {
    page = doc.addPage(A4);
    y = A4[1] - MARGIN;
  };
  const text = (s: string, { size = 10, font = regular, color = rgb(0.1, 0.1, 0.12), indent = 0, gap = 2 } = {}) => {
    for (const line of wrap(s, font, size, width - indent)) {
      if (y - size < MARGIN + 20) newPage();
      page.drawText(line, { x: MARGIN + indent, y: y - size, size, font, color });
      y -= size + gap;
    }
  };
  const space = (h: number) => {
    y -= h;
  };
  const rule = () => {
    if (y < MARGIN + 40) newPage();
    page.drawLine({
      start: { x: MARGIN, y },
      end: { x: A4[0] - MARGIN, y },
      thickness: 0.5,
      color: rgb(0.6, 0.6, 0.65),
    });
    y -= 8;
  };

  text("Audit report", { size: 22, font: bold, gap: 6 });
  text(input.facilityName, { size: 12, font: bold });
  text(`Period: ${when(input.from)} to ${when(input.to)}`, { size: 11 });
  text(`Generated ${when(input.generatedAt)} by ${input.generatedBy}`, { size: 11 });
  space(6);
  const flagged = input.records.filter((r) => r.flags.length).length;
  const audited = input.records.filter((r) =>
    r.findings.some((f) => f.signatures.some((s) => s.meaning === "audited")),
  ).length;
  text(
    `${input.records.length} records: ${flagged} with flags, ${audited} audited and signed, ${input.records.length - audited} not yet audited.`,
    { size: 11 },
  );
  space(6);
  text("Chain check", { size: 13, font: bold, gap: 4 });
  for (const c of input.chains)
    text(`${c.chain}: ${c.ok ? "verified" : "BROKEN"} (${c.count} entries). ${c.message}`, {
      indent: 10,
      color: c.ok ? rgb(0.1, 0.1, 0.12) : rgb(0.7, 0.1, 0.1),
    });
  space(6);
  text(input.deferral, { size: 9, color: rgb(0.35, 0.35, 0.4) });
  space(8);

  for (const r of input.records) {
    rule();
    text(`${r.title} — ${r.cryostatName}, ${when(r.recordedAt)}`, { size: 12, font: bold, gap: 4 });
    text(`Recorded by ${r.authorName}. Record ${r.id}`, { size: 9, color: rgb(0.35, 0.35, 0.4) });
    if (r.correction) {
      const c = r.correction;
      text(
        `CORRECTION by ${r.authorName} at ${when(r.recordedAt)} of the record made by ${c.originalAuthorName} at ${when(c.originalRecordedAt)} (record ${c.originalId}). Reason: ${c.reason}`,
        { font: bold, indent: 10, color: rgb(0.7, 0.35, 0) },
      );
      text("Original as recorded (kept in the log):", { indent: 10 });
      for (const l of c.original) text(l, { indent: 20, color: rgb(0.35, 0.35, 0.4) });
      text("As corrected:", { indent: 10 });
    }
    for (const l of r.lines) text(l, { indent: 10 });
    if (r.figures.length) {
      text("Computed (estimates where stated):", { font: bold, indent: 10 });
      for (const l of r.figures) text(l, { indent: 20 });
    }
    text(r.flags.length ? `Flags: ${r.flags.join("; ")}` : "Flags: none", {
      font: bold,
      indent: 10,
      color: r.flags.length ? rgb(0.7, 0.35, 0) : rgb(0.1, 0.45, 0.2),
    });
    text("Signatures on the record:", { font: bold, indent: 10 });
    if (!r.signatures.length) text("none", { indent: 20 });
    for (const s of r.signatures) text(manifestation(s), { indent: 20 });
    if (!r.findings.length) text("Audit: not yet audited.", { font: bold, indent: 10 });
    for (const f of r.findings) {
      text(
        `Audit finding (${f.verdict === "needs_action" ? "NEEDS ACTION" : "acceptable"}) by ${f.by}, ${when(f.at)}: ${f.text || "(no text)"}`,
        { indent: 10, font: bold },
      );
      if (!f.signatures.length) text("Finding not signed.", { indent: 20 });
      for (const s of f.signatures) text(manifestation(s), { indent: 20 });
    }
    text(`Record hash (SHA-256, RFC 8785 canonical JSON): ${r.hash}`, { size: 7, color: rgb(0.4, 0.4, 0.45) });
    space(4);
  }

  const pages = doc.getPages();
  pages.forEach((p, i) => {
    p.drawText(
      winAnsi(
        `Rimelog audit report · ${input.from.slice(0, 10)} to ${input.to.slice(0, 10)} · page ${i + 1} of ${pages.length}`,
      ),
      {
        x: MARGIN,
        y: MARGIN - 20,
        size: 8,
        font: regular,
        color: rgb(0.4, 0.4, 0.45),
      },
    );
  });
  return doc.save();
}
