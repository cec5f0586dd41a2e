// What the audit side shows of a record: its signatures, findings, flags and figures. Built by the
// server's audit queries, read by the audit screens, the CSV and the PDF report.
import type { QuenchFigures, TransferFigures } from "@/lib/audit/figures";
import type { Flag } from "@/lib/audit/flags";
import type { StoredEntry } from "@/lib/schemas/entry";

export type SignatureView = {
  entryId: string;
  signedEntryId: string;
  meaning: string;
  signerId: string;
  signerName: string;
  signerRole: string;
  signedAt: string;
  signedHash: string;
  confirmedBy: string | null;
  image: string | null;
};
export type FindingView = {
  id: string;
  verdict: "acceptable" | "needs_action";
  findings: string;
  flags: string[];
  authorName: string;
  recordedAt: string;
  signatures: SignatureView[];
};

/** The record a correction replaces, kept and shown beside it: who wrote it, when, and why it was corrected. */
export type CorrectedOriginal = {
  entry: StoredEntry;
  authorName: string;
  peopleNames: string[];
  signatures: SignatureView[];
};

export type AuditItem = {
  entry: StoredEntry;
  /** Set when this record is a correction: the original it replaces (the correction's reason is entry.reason). */
  corrects: CorrectedOriginal | null;
  cryostatName: string;
  authorName: string;
  peopleNames: string[];
  flags: Flag[];
  signatures: SignatureView[];
  findings: FindingView[];
  /** The latest signed finding decides: null when not yet audited (no finding with an `audited` signature). */
  verdict: "acceptable" | "needs_action" | null;
  figures: TransferFigures | QuenchFigures | null;
};
