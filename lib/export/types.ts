// What every exported record carries, whatever the format (CSV rows, PDF report sections).

/** A signature's manifestation: printed name, role, date-time (UTC) and meaning. */
export type ExportSignature = { meaning: string; signerName: string; signerRole: string; signedAt: string };

export type ExportRecordBase = {
  id: string;
  kind: string;
  recordedAt: string;
  cryostatName: string;
  authorName: string;
  flags: string[];
  hash: string;
};
