// What every exported record carries, whatever the format (CSV rows, PDF report sections).

/** A signature's manifestation: printed name, role, date-time (UTC) and meaning. */
export type ExportSignature = { meaning: string; signerName: string; signerRole: string; signedAt: string };

/** A corrected record: the original it replaces, who wrote it and when, and the correction's reason. */
export type ExportCorrection = {
  originalId: string;
  originalRecordedAt: string;
  originalAuthorName: string;
  reason: string;
  /** The original as recorded, in the same words as the record's own lines. */
  original: string[];
};

export type ExportRecordBase = {
  id: string;
  /** Null unless this record corrects another. */
  correction: ExportCorrection | null;
  kind: string;
  recordedAt: string;
  cryostatName: string;
  authorName: string;
  flags: string[];
  hash: string;
};
